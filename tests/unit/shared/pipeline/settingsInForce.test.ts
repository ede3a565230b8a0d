import { describe, expect, it } from 'vitest'
import { defaultIndicatorSettings } from '../../../../shared/pipeline/indicatorDefaults'
import { entryAt, settingsSchedule } from '../../../../shared/pipeline/settingsInForce'

// Which settings version governed which samples, as the replay reads it from the points each
// version produced (the rule is ours: docs/design.md, replays).
const settings = (evaluateEvery: number) => ({ ...defaultIndicatorSettings(10), evaluateEvery })

describe('settings versions in force', () => {
  it('starts each version after the last point of the one before', () => {
    const schedule = settingsSchedule([
      { id: 3, settings: settings(20), lastPointS: 1_000 },
      { id: 4, settings: settings(30), lastPointS: 2_000 },
      { id: 5, settings: settings(40), lastPointS: null },
    ])
    expect(schedule.map(e => [e.versionId, e.afterS])).toEqual([[3, null], [4, 1_000], [5, 2_000]])
    expect([0, 1_000, 1_000.5, 2_000, 2_001].map(t => schedule[entryAt(schedule, t)]!.versionId)).toEqual([3, 3, 4, 4, 5])
  })

  it('passes the start of a version that produced no point on to the next', () => {
    const schedule = settingsSchedule([
      { id: 1, settings: settings(20), lastPointS: 500 },
      { id: 2, settings: settings(25), lastPointS: null },
      { id: 3, settings: settings(30), lastPointS: 900 },
    ])
    expect(schedule.map(e => e.afterS)).toEqual([null, 500, 500])
    // Two versions starting together: the later one governs, the earlier one governed nothing.
    expect(schedule[entryAt(schedule, 600)]!.versionId).toBe(3)
    expect(schedule[entryAt(schedule, 400)]!.versionId).toBe(1)
  })

  it('is one version throughout when there is one', () => {
    const schedule = settingsSchedule([{ id: 7, settings: settings(20), lastPointS: 100 }])
    expect(entryAt(schedule, -1e9)).toBe(0)
    expect(entryAt(schedule, 1e12)).toBe(0)
  })
})
