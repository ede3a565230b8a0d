// The text of alarm e-mails. Pure, so every line can be unit-tested: the priority, the tag and
// unit, the value and the trend behind it, the fold horizon with its band, the rationale's
// operator action, a link, and the advisory caution.
import { ADVISORY_CAUTION, priorityRank, type AlarmClass, type Priority } from '../alarms/vocabulary'
import { formatDuration } from '../utils/duration'
import { pValueText } from '../utils/numberText'
import { number, plantTime } from './format'

export interface AlarmMailFacts {
  alarmId: number
  priority: Priority
  alarmClass: AlarmClass
  siteName: string
  timeZone: string
  unitCode: string
  unitName: string
  /** null for a unit rule. */
  tagCode: string | null
  tagDescription: string | null
  engineeringUnit: string | null
  ruleName: string
  /** What the rule watches, in words ("value", "lag-1 autocorrelation", …). */
  measureLabel: string
  comparison: 'above' | 'below'
  threshold: number
  /** The value at the latest activation. */
  value: number | null
  /** The first activation of this occurrence. */
  raisedAt: string
  /** The latest activation (the first until the alarm re-activates). */
  activatedAt: string
  /** Activations in this occurrence, the first included. */
  activationCount: number
  latestValue: number | null
  /** Whether the occurrence is still open (not back to normal) now. */
  standing: boolean
  trend: {
    tauAr1: number | null, pAr1: number | null, tauVariance: number | null, pVariance: number | null, evidence: string | null
  } | null
  fold: { kind: 'projected', seconds: number, lowSeconds: number, highSeconds: number } | { kind: 'none' }
  consequence: string
  likelyCause: string
  operatorAction: string
  link: string
}

const PRIORITY_WORD: Record<Priority, string> = { urgent: 'URGENT', high: 'HIGH', medium: 'MEDIUM', low: 'LOW' }

const target = (f: AlarmMailFacts) => (f.tagCode ? `${f.tagCode} (${f.unitCode})` : `unit ${f.unitCode}`)
const kind = (c: AlarmClass) => (c === 'alarm' ? 'alarm' : 'advisory alert')

export function alarmMailSubject(f: AlarmMailFacts): string {
  return `[Brinkline ${PRIORITY_WORD[f.priority]} ${kind(f.alarmClass)}] ${target(f)}: ${f.measureLabel} ${f.comparison} ${number(f.threshold)}`
}

export function foldLine(fold: AlarmMailFacts['fold']): string {
  if (fold.kind === 'none') return 'Fold horizon: no fold in view (the recovery rate is not falling significantly).'
  return `Fold horizon: projected in ${formatDuration(fold.seconds)} (band ${formatDuration(fold.lowSeconds)} to ${formatDuration(fold.highSeconds)}).`
}

const DECISION_REASON: Record<string, string> = {
  'slowing down': 'the autocorrelation (recovery-rate) test is below its per-look significance level with the autocorrelation rising, and the variance is not falling',
  'noise level changed': 'the variance changed significantly, but the autocorrelation did not rise significantly; a variance change alone is not slowing down',
  'no trend': 'neither p is at or below the per-look significance level (kept far below 0.05 because the test is repeated every few samples), so no trend is claimed',
}

export function trendLines(trend: AlarmMailFacts['trend']): string[] {
  if (!trend) return ['Trend: not evaluated yet for this tag.']
  return [
    `Trend of lag-1 autocorrelation: Kendall tau ${number(trend.tauAr1)}; stability test p ${pValueText(trend.pAr1)} against surrogates.`,
    `Trend of variance: Kendall tau ${number(trend.tauVariance)}; change p ${pValueText(trend.pVariance)}.`,
    ...(trend.evidence ? [`Early-warning decision: ${trend.evidence}, because ${DECISION_REASON[trend.evidence] ?? 'of the tests above'}.`] : []),
  ]
}

/** The latest activation, and for a re-activation which one it is and when the occurrence began. */
export function activationLines(f: Pick<AlarmMailFacts, 'activatedAt' | 'raisedAt' | 'activationCount' | 'value' | 'timeZone'>, unitOfMeasure: string): string[] {
  if (f.activationCount <= 1) return [`Raised:    ${plantTime(f.activatedAt, f.timeZone)} at ${number(f.value)}${unitOfMeasure}`]
  return [
    `Raised again: ${plantTime(f.activatedAt, f.timeZone)} at ${number(f.value)}${unitOfMeasure}`,
    `           activation ${f.activationCount} of this occurrence, first raised ${plantTime(f.raisedAt, f.timeZone)}`,
  ]
}

export function renderAlarmMail(f: AlarmMailFacts): { subject: string, text: string } {
  const unitOfMeasure = f.measureLabel === 'value' && f.engineeringUnit ? ` ${f.engineeringUnit}` : ''
  const lines = [
    `${PRIORITY_WORD[f.priority]} priority ${kind(f.alarmClass)} at ${f.siteName}`,
    '',
    `Where:     ${target(f)}${f.tagDescription ? ` — ${f.tagDescription}` : ''}, ${f.unitName}`,
    `Rule:      ${f.ruleName}`,
    `Condition: ${f.measureLabel} ${f.comparison} ${number(f.threshold)}${unitOfMeasure}`,
    ...activationLines(f, unitOfMeasure),
    `Latest:    ${number(f.latestValue)}${f.tagCode && f.engineeringUnit ? ` ${f.engineeringUnit}` : ''}`,
    '',
    ...trendLines(f.trend),
    foldLine(f.fold),
    '',
    `Operator action: ${f.operatorAction}`,
    `Consequence if no action: ${f.consequence}`,
    `Likely cause: ${f.likelyCause}`,
    '',
    `Open the alarm: ${f.link}`,
    '',
    ADVISORY_CAUTION,
  ]
  return { subject: alarmMailSubject(f), text: lines.join('\n') }
}

/** One mail for many alarms during a flood: one block per alarm, most urgent first. */
export function renderDigestMail(
  input: { siteName: string, alarms: AlarmMailFacts[], listLink: string },
): { subject: string, text: string } {
  const sorted = [...input.alarms].sort((a, b) => priorityRank(a.priority) - priorityRank(b.priority) || a.alarmId - b.alarmId)
  const blocks = sorted.map(f => [
    `- ${PRIORITY_WORD[f.priority]} ${kind(f.alarmClass)} ${target(f)}: ${f.measureLabel} ${f.comparison} ${number(f.threshold)}, ${f.activationCount > 1 ? `raised again (activation ${f.activationCount})` : 'raised'} ${plantTime(f.activatedAt, f.timeZone)} at ${number(f.value)}`,
    `  ${foldLine(f.fold)}`,
    `  Operator action: ${f.operatorAction}`,
    `  ${f.link}`,
  ].join('\n'))
  const text = [
    `Alarm flood at ${input.siteName}: ${sorted.length} alarms gathered into this one message (more than 10 alarms in 10 minutes).`,
    '',
    ...blocks,
    '',
    `All active alarms: ${input.listLink}`,
    '',
    ADVISORY_CAUTION,
  ].join('\n')
  return { subject: `[Brinkline flood digest] ${input.siteName}: ${sorted.length} alarms`, text }
}

// Moved beside the closed set it labels; re-exported for the mail's callers.
export { MEASURE_LABELS } from '../alarms/vocabulary'
