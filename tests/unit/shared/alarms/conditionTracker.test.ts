import { describe, expect, it } from 'vitest'
import { INACTIVE, maxActivationsWithin, stepCondition, type ConditionSettings, type ConditionState } from '../../../../shared/alarms/conditionTracker'
import { createRng } from '../../../../shared/analysis/random'

/** Activation times (s) of a rule run over a series. */
function activations(settings: ConditionSettings, times: number[], values: number[]): number[] {
  let state: ConditionState = INACTIVE
  const out: number[] = []
  times.forEach((t, i) => {
    const step = stepCondition(settings, state, t, values[i]!)
    state = step.state
    if (step.change === 'activate') out.push(t)
  })
  return out
}

const HIGH: ConditionSettings = { comparison: 'above', threshold: 80, deadband: 0, onDelayS: 0, offDelayS: 0 }

describe('condition tracker (generic limit logic, docs/science.md §S7.3)', () => {
  it('activates at x ≥ H and clears at x < H − deadband (docs/science.md §S7.3, derived)', () => {
    const rule = { ...HIGH, deadband: 4 }
    let s = stepCondition(rule, INACTIVE, 0, 80)
    expect(s.change).toBe('activate')
    s = stepCondition(rule, s.state, 1, 76.5)
    expect(s.change).toBeNull()
    s = stepCondition(rule, s.state, 2, 76)
    expect(s.change).toBeNull()
    s = stepCondition(rule, s.state, 3, 75.9)
    expect(s.change).toBe('return')
  })

  it('mirrors the logic for a low limit', () => {
    const rule: ConditionSettings = { comparison: 'below', threshold: 10, deadband: 1, onDelayS: 0, offDelayS: 0 }
    let s = stepCondition(rule, INACTIVE, 0, 10.5)
    expect(s.change).toBeNull()
    s = stepCondition(rule, s.state, 1, 10)
    expect(s.change).toBe('activate')
    s = stepCondition(rule, s.state, 2, 11)
    expect(s.change).toBeNull()
    s = stepCondition(rule, s.state, 3, 11.01)
    expect(s.change).toBe('return')
  })

  it('needs the condition to hold for the whole on-delay and the clearance for the whole off-delay', () => {
    const rule = { ...HIGH, onDelayS: 15, offDelayS: 15 }
    expect(activations(rule, [0, 10, 14], [81, 81, 81])).toEqual([])
    expect(activations(rule, [0, 10, 12, 20, 35], [81, 81, 79, 81, 81])).toEqual([35])
    let s = stepCondition(rule, { active: true, pendingSince: null, clearingSince: null }, 0, 70)
    s = stepCondition(rule, s.state, 14, 70)
    expect(s.change).toBeNull()
    expect(stepCondition(rule, s.state, 15, 70).change).toBe('return')
  })

  it('lets missing observations neither raise nor clear', () => {
    const active: ConditionState = { active: true, pendingSince: null, clearingSince: null }
    expect(stepCondition(HIGH, active, 5, Number.NaN)).toEqual({ state: active, change: null })
    expect(stepCondition(HIGH, INACTIVE, 5, Number.NaN).change).toBeNull()
  })

  it('treats an infinitely distant fold as beyond any "below" limit', () => {
    const rule: ConditionSettings = { comparison: 'below', threshold: 3600, deadband: 0, onDelayS: 0, offDelayS: 0 }
    const on = stepCondition(rule, INACTIVE, 0, 1800)
    expect(on.change).toBe('activate')
    expect(stepCondition(rule, on.state, 1, Number.POSITIVE_INFINITY).change).toBe('return')
  })

  // Chattering: ≥3 activations in 60 s (docs/science.md §S7.4 [R: secondary page]). Flow starting values
  // from the ISA-18.2-2009 tables (TR18.2.3): 5 % of span deadband, 15 s delays (docs/science.md §S7.3
  // [from memory]). The signal is an invented flow swinging slowly across its high limit (span
  // 0–100) with 1 % noise: it really exceeds the limit three times, and chatters at each crossing.
  it('deadband and delays stop a noisy signal at its limit from chattering', () => {
    const rng = createRng(2024)
    const times = Array.from({ length: 1800 }, (_, i) => i)
    let x = 0
    const values = times.map(t => (x = 0.5 * x + rng.normal()) + 80 + 8 * Math.sin(2 * Math.PI * t / 600))
    const bare = activations(HIGH, times, values)
    expect(maxActivationsWithin(bare, 60)).toBeGreaterThanOrEqual(3)
    const tuned = activations({ ...HIGH, deadband: 5, onDelayS: 15, offDelayS: 15 }, times, values)
    expect(tuned).toHaveLength(3)
    expect(maxActivationsWithin(tuned, 60)).toBeLessThan(3)
  })

  it('counts activations inside any 60 s span', () => {
    expect(maxActivationsWithin([0, 30, 60, 61, 200], 60)).toBe(3)
    expect(maxActivationsWithin([0, 61, 122], 60)).toBe(1)
    expect(maxActivationsWithin([], 60)).toBe(0)
  })
})
