import { csvRecord } from './csvField'
import { wallClockText } from './timeText'

/** One line of an incident's timeline: an alarm event or a shift-log note. */
export interface TimelineEntry {
  at: string
  kind: 'alarm event' | 'shift-log note'
  alarmId: number | null
  name: string
  priority: string | null
  alarmClass: string | null
  event: string
  fromState: string | null
  toState: string | null
  who: string
  text: string
  value: number | null
}

const HEADER = ['time (UTC)', 'plant time', 'kind', 'alarm id', 'alarm or note', 'priority', 'class', 'event', 'from state', 'to state', 'who', 'comment or note', 'value']

/** The incident's events as CSV (RFC 4180, formula-safe, shared/utils/csvField), plant time named with its zone. */
export function incidentEventsCsv(entries: TimelineEntry[], timeZone: string): string {
  const zone = `plant time (${timeZone})`
  const lines = [csvRecord(HEADER.map(h => (h === 'plant time' ? zone : h)))]
  for (const e of entries) {
    lines.push(csvRecord([e.at, wallClockText(e.at, timeZone), e.kind, e.alarmId, e.name, e.priority, e.alarmClass, e.event,
      e.fromState, e.toState, e.who, e.text, e.value]))
  }
  return `${lines.join('\r\n')}\r\n`
}
