// A tile's status from the latest evaluation: the detrender's warm-up and the restart after a step
// are not data faults, so they never read "bad quality" (docs/design.md tile states).
import { describe, expect, it } from 'vitest'
import { evaluateRecord, SETTLING } from '#shared/pipeline/evaluateRecord'
import { defaultIndicatorSettings } from '#shared/pipeline/indicatorDefaults'
import { deriveTagStatus } from '#shared/pipeline/tagStatus'

const settings = defaultIndicatorSettings(1)
const times = Float64Array.from({ length: 40 }, (_, i) => i)
const values = Float64Array.from(times, t => Math.sin(t))
const warming = evaluateRecord({
  tagId: 1, times, values, firstNew: 39, samplesSinceEvaluation: settings.evaluateEvery - 1, samplePeriodS: 1, settings
}).points[0]!
const status = (latest: typeof warming) => deriveTagStatus({ now: 40, latestTime: 39, samplePeriodS: 1, latest, openAlarms: [] })

describe('tile status of a tag that is not judged yet', () => {
  it('warming up: steady with "analysis pending", not bad quality', () => {
    expect(warming.quality).toMatch(/^warming up/)
    expect(status(warming)).toEqual({ status: 'steady', reason: `analysis pending (${warming.quality})` })
  })

  it('settling after a step: watch', () => {
    expect(status({ ...warming, quality: SETTLING }).status).toBe('watch')
  })

  it('past the warm-up, before the first trend test: steady with "trend test pending", never a verdict', () => {
    // One bandwidth of warm-up (50) plus the quality gate's 100 samples, short of the 200 of a trend window.
    const n = 200
    const t = Float64Array.from({ length: n }, (_, i) => i)
    const v = Float64Array.from(t, x => Math.sin(x / 3) + 0.3 * Math.cos(x * 1.7))
    const point = evaluateRecord({
      tagId: 1, times: t, values: v, firstNew: n - 1, samplesSinceEvaluation: settings.evaluateEvery - 1, samplePeriodS: 1, settings
    }).points[0]!
    expect(point.quality).toBeNull()
    expect(point.evidence).toBeNull()
    expect(deriveTagStatus({ now: n, latestTime: n - 1, samplePeriodS: 1, latest: point, openAlarms: [] }))
      .toEqual({ status: 'steady', reason: 'trend test pending (the trend window is still filling)' })
  })

  it('an annunciated alarm or alert outranks settling and warming up, and the restart is still said', () => {
    const withOpen = (latest: typeof warming, alarmClass: 'alarm' | 'alert') => deriveTagStatus({
      now: 40, latestTime: 39, samplePeriodS: 1, latest, openAlarms: [{ alarmClass, state: 'unacknowledged', name: 'TI-1 high' }],
    })
    expect(withOpen({ ...warming, quality: SETTLING }, 'alarm'))
      .toEqual({ status: 'alarm', reason: 'TI-1 high; settling after a step: windows restarted' })
    expect(withOpen({ ...warming, quality: SETTLING }, 'alert').status).toBe('warning')
    expect(withOpen(warming, 'alarm')).toEqual({ status: 'alarm', reason: 'TI-1 high' })
  })

  it('a real data fault stays bad quality, above an open alarm too (its indicators are not trusted)', () => {
    expect(deriveTagStatus({
      now: 40, latestTime: 39, samplePeriodS: 1, latest: { ...warming, quality: 'stuck: all 40 values equal 1' },
      openAlarms: [{ alarmClass: 'alarm', state: 'unacknowledged', name: 'TI-1 high' }],
    }).status).toBe('bad quality')
  })

  it('a real data fault stays bad quality', () => {
    expect(status({ ...warming, quality: 'stuck: all 40 values equal 1' }).status).toBe('bad quality')
  })
})
