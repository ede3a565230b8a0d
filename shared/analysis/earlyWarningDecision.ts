// The alarm-worthy criterion, shared by the live task, replays and the detection benchmark.
// It alarms on recovery-rate evidence only (SCIENCE.md A5 item 11): a significant rise of AR1
// (equivalently a fall of k = −ln AR1/Δt) with a variance that is not falling. A variance rise
// without it is reported as "noise level changed", never as slowing down. The evidence must hold
// for an on-delay of consecutive evaluations and clears after an off-delay (ISA-18.2-style
// hysteresis, SCIENCE.md D), which limits chattering from re-testing overlapping data.
import type { TrendTestResult } from './trendTest'

export interface EarlyWarningRule {
  /** Surrogate p at or below which the AR1 trend counts (one-sided, rising). */
  alpha: number
  /** Kendall τ of AR1 over the trend window must also reach this. */
  minTau: number
  /** Consecutive evaluations with evidence before the alarm raises. */
  onDelay: number
  /** Consecutive evaluations without evidence before it clears. */
  offDelay: number
}

export type TrendEvidence = 'slowing down' | 'noise level changed' | 'no trend'

/** What one evaluation's trend tests say. */
export function judgeTrends(ar1: TrendTestResult, variance: TrendTestResult, rule: EarlyWarningRule): TrendEvidence {
  if (ar1.p <= rule.alpha && ar1.tau >= rule.minTau && variance.tau > 0) return 'slowing down'
  if (variance.p <= rule.alpha) return 'noise level changed'
  return 'no trend'
}

/** On-delay / off-delay latch over successive evaluations. */
export class EarlyWarningLatch {
  private active = false
  private streak = 0

  constructor(private readonly rule: EarlyWarningRule) {}

  get isActive(): boolean {
    return this.active
  }

  /** Feeds one evaluation; returns 'raised' or 'cleared' on a change, else null. */
  update(evidence: TrendEvidence): 'raised' | 'cleared' | null {
    const holding = evidence === 'slowing down'
    // The streak counts evaluations that argue for changing the current state.
    this.streak = holding !== this.active ? this.streak + 1 : 0
    if (!this.active && this.streak >= this.rule.onDelay) {
      this.active = true
      this.streak = 0
      return 'raised'
    }
    if (this.active && this.streak >= this.rule.offDelay) {
      this.active = false
      this.streak = 0
      return 'cleared'
    }
    return null
  }
}
