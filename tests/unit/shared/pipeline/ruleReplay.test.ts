import { describe, expect, it } from 'vitest'
import { INACTIVE, type ConditionSettings } from '../../../../shared/alarms/conditionTracker'
import type { EvaluationPoint } from '../../../../shared/pipeline/evaluateRecord'
import { replayConditions, tagObservations } from '../../../../shared/pipeline/ruleReplay'

const point = (time: number, ar1: number): EvaluationPoint => ({
  time, quality: null, variance: 1, std: 1, cv: null, ar1, recoveryRate: null, skewness: null, kurtosis: null,
  tauAr1: null, pAr1: null, tauVariance: null, pVariance: null, evidence: null, fold: { kind: 'none' },
})

describe('tagObservations', () => {
  it('feeds each new sample to the value rules, then the points up to it to the others, in time order', () => {
    const times = [0, 10, 20, 30]
    const values = [1, 2, 3, 4]
    const points = [point(20, 0.5), point(30, 0.9)]
    const seen = [...tagObservations(times, values, [0, 0, 0, 0], 1, points, ['value', 'ar1'], point(0, 0.1))]
      .map(o => [o.rule, o.time, o.value, o.current?.time ?? null])
    expect(seen).toEqual([
      [0, 10, 2, 0], // the sample before firstNew is history only
      [0, 20, 3, 0], [1, 20, 0.5, 20],
      [0, 30, 4, 20], [1, 30, 0.9, 30],
    ])
  })
})

describe('tagObservations and sample quality', () => {
  it('gives value rules no observation from an uncertain sample, while the indicator points still flow', () => {
    // Uncertain status (IEC 62541-4 §7.39; quality code 1) is instrument doubt, not a process state:
    // it must neither raise nor clear a limit alarm (docs/science.md §S7.3).
    const points = [point(20, 0.5)]
    const seen = [...tagObservations([0, 10, 20], [1, 99, 3], [0, 1, 0], 0, points, ['value', 'ar1'], null)]
      .map(o => [o.rule, o.time, o.value])
    expect(seen).toEqual([[0, 0, 1], [0, 20, 3], [1, 20, 0.5]])
  })
})

describe('replayConditions', () => {
  // The on-delay / deadband / off-delay logic of ISA-18.2 alarm handling (docs/science.md §S7.3):
  // raise once x ≥ H has held for the on-delay, return once x < H − deadband has held for the off-delay.
  const rule: ConditionSettings = { comparison: 'above', threshold: 10, deadband: 1, onDelayS: 20, offDelayS: 0 }
  it('raises after the on-delay and returns below the deadband, carrying state between calls', () => {
    const states = [{ ...INACTIVE }]
    const obs = (time: number, value: number) => ({ rule: 0, time, value, current: null })
    const first = replayConditions([rule], states, [obs(0, 11), obs(10, 12)])
    expect(first).toEqual([]) // held 10 s of the 20 s on-delay
    const second = replayConditions([rule], states, [obs(20, 11), obs(30, 9.5), obs(40, 8.9)])
    expect(second).toEqual([
      { rule: 0, time: 20, value: 11, change: 'activate' },
      { rule: 0, time: 40, value: 8.9, change: 'return' }, // 9.5 is inside the deadband
    ])
  })
})
