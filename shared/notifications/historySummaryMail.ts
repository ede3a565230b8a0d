// The one message about alarms raised from old history (docs/design.md §D4 item 5): instead of a
// mail per activation hours after the fact, one summary per site saying what was recorded and,
// first, which of those alarms still stand now.
import { ADVISORY_CAUTION, priorityRank } from '../alarms/vocabulary'
import { activationLines, alarmMailSubject, type AlarmMailFacts } from './alarmMail'
import { formatDuration } from '../utils/duration'
import { number } from './format'

export interface HistorySummaryInput {
  siteName: string
  /** Each alarm once, with its state now. */
  alarms: AlarmMailFacts[]
  /** Activations gathered (an alarm re-activating in the history counts each time). */
  activations: number
  maxAgeMinutes: number
  listLink: string
}

export function renderHistorySummaryMail(input: HistorySummaryInput): { subject: string, text: string } {
  const order = (a: AlarmMailFacts, b: AlarmMailFacts) => priorityRank(a.priority) - priorityRank(b.priority) || a.alarmId - b.alarmId
  const standing = input.alarms.filter(f => f.standing).sort(order)
  const over = input.alarms.filter(f => !f.standing).sort(order)
  const block = (f: AlarmMailFacts) => [
    `- ${alarmMailSubject(f).replace(/^\[Brinkline /, '').replace(/\] /, ': ')}`,
    ...activationLines(f, '').map(l => `  ${l.trim()}`),
    ...(f.standing ? [`  Latest: ${number(f.latestValue)}${f.engineeringUnit && f.tagCode ? ` ${f.engineeringUnit}` : ''}`, `  Operator action: ${f.operatorAction}`] : []),
    `  ${f.link}`,
  ].join('\n')
  const lines = [
    `Brinkline recorded ${input.activations} alarm activation${input.activations === 1 ? '' : 's'} at ${input.siteName} from samples more than ${input.maxAgeMinutes} min old`
    + ' (back-filled by a gateway or uploaded from a historian).',
    'They were not mailed one by one; they are in the alarm history and on the charts.',
    '',
    ...(standing.length > 0
      ? [`Still standing now (${standing.length}):`, ...standing.map(block)]
      : ['None of them is still standing.']),
    ...(over.length > 0 ? ['', `Back to normal since (${over.length}):`, ...over.map(block)] : []),
    '',
    `All active alarms: ${input.listLink}`,
    '',
    ADVISORY_CAUTION,
  ]
  const subject = `[Brinkline history summary] ${input.siteName}: ${input.alarms.length} alarm${input.alarms.length === 1 ? '' : 's'} from old history, ${standing.length} still standing`
  return { subject, text: lines.join('\n') }
}

/** The activation event's comment, so the alarm's trail says why no mail went out. */
export function historyNoticeComment(ageSeconds: number): string {
  return `from old history (the sample is ${formatDuration(ageSeconds)} older than its recording): no mail of its own, listed in the site's history summary`
}
