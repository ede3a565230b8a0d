// The overview's status of one tag (docs/design.md §D3), from its data, its latest evaluation and its
// open alarms. Data problems come first: a tag with no data or bad data shows that, never
// "steady", and its indicators are not trusted.
import type { AlarmClass, AlarmState, TagStatus } from '../alarms/vocabulary'
import { SETTLING, WARMING_UP, type EvaluationPoint } from './evaluateRecord'
import { formatDuration } from '../utils/duration'
import { NO_DATA_PERIODS } from '../utils/tileStatus'
import { pValueText } from '../utils/numberText'

/**
 * A stability-trend p at or below this puts the tag on watch before it is significant (α 0.0025 or less).
 * A calibrated p is at most 0.1 on a tenth of a steady tag's looks, so 0.1 kept steady tags on watch.
 */
export const WATCH_P = 0.01

const SETTLING_REASON = 'settling after a step: windows restarted'

export interface StatusInput {
  now: number
  latestTime: number | null
  samplePeriodS: number
  latest: EvaluationPoint | null
  openAlarms: { alarmClass: AlarmClass, state: AlarmState, name: string }[]
}

export function deriveTagStatus(input: StatusInput): { status: TagStatus, reason: string } {
  const silentFor = input.latestTime === null ? Number.POSITIVE_INFINITY : input.now - input.latestTime
  if (silentFor > NO_DATA_PERIODS * input.samplePeriodS)
    return { status: 'no data', reason: input.latestTime === null ? 'no samples yet' : `no sample for ${formatDuration(silentFor)} (over ${NO_DATA_PERIODS} sample periods)` }
  const p = input.latest
  // After a trip, reset or setpoint change the windows restart, and a new tag's detrender warms
  // up: neither is a data fault, and neither may hide an alarm. A trip is when limit alarms stand,
  // so "watch, settling" above an unacknowledged alarm would understate the tag at its worst moment.
  const settling = p?.quality === SETTLING
  const warming = p?.quality?.startsWith(WARMING_UP) ?? false
  if (p?.quality && !settling && !warming) return { status: 'bad quality', reason: p.quality }
  const annunciated = input.openAlarms.filter(a => a.state === 'unacknowledged' || a.state === 'acknowledged')
  const restarted = settling ? `; ${SETTLING_REASON}` : ''
  const alarm = annunciated.find(a => a.alarmClass === 'alarm')
  if (alarm) return { status: 'alarm', reason: alarm.name + restarted }
  const alert = annunciated.find(a => a.alarmClass === 'alert')
  if (alert) return { status: 'warning', reason: alert.name + restarted }
  if (settling) return { status: 'watch', reason: SETTLING_REASON }
  if (warming) return { status: 'steady', reason: `analysis pending (${p!.quality})` }
  if (p?.evidence === 'slowing down' && p.fold.kind === 'projected')
    return { status: 'warning', reason: `slowing down; fold projected in ${formatDuration(p.fold.seconds)}` }
  if (p?.evidence === 'slowing down') return { status: 'watch', reason: `slowing down (autocorrelation trend p ${pValueText(p.pAr1)})` }
  if (p?.evidence === 'noise level changed') return { status: 'watch', reason: 'noise level changed (variance up without slowing down)' }
  if (p?.pAr1 !== null && p?.pAr1 !== undefined && p.pAr1 <= WATCH_P)
    return { status: 'watch', reason: `autocorrelation rising (p ${pValueText(p.pAr1)})` }
  // Past the warm-up but short of the first trend window: indicators, no judgement yet.
  if (p && p.evidence === null) return { status: 'steady', reason: 'trend test pending (the trend window is still filling)' }
  return { status: 'steady', reason: '' }
}

/** The indicator whose trend is most significant: the one the tile leads with. */
export function leadingIndicator(p: EvaluationPoint | null): { name: 'ar1' | 'variance', value: number | null, tau: number | null, p: number | null } | null {
  if (!p || p.pAr1 === null || p.pVariance === null) return null
  return p.pVariance < p.pAr1
    ? { name: 'variance', value: p.variance, tau: p.tauVariance, p: p.pVariance }
    : { name: 'ar1', value: p.ar1, tau: p.tauAr1, p: p.pAr1 }
}
