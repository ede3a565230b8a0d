// How times read on every screen (docs/design.md §D9): one format, the plant's wall clock, with
// the zone named, and an age beside it where a list is scanned for what is new.
import { formatDuration } from './duration'

const formatters = new Map<string, Intl.DateTimeFormat>()

function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone)
  if (!f) {
    // en-CA writes year-month-day: the one order nobody misreads, and the order ISO 8601 uses.
    f = new Intl.DateTimeFormat('en-CA', {
      timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23',
    })
    formatters.set(timeZone, f)
  }
  return f
}

/** "2026-07-01 09:00:00" on the wall clock of `timeZone`. */
export function wallClockText(at: string | Date, timeZone: string): string {
  return formatter(timeZone).format(new Date(at)).replace(',', '')
}

/** "2026-07-01 09:00:00 Europe/London"; "—" for no time. */
export function plantDateTime(at: string | Date | null | undefined, timeZone: string): string {
  if (at === null || at === undefined || Number.isNaN(new Date(at).getTime())) return '—'
  return `${wallClockText(at, timeZone)} ${timeZone}`
}

/** "just now", "12 min ago", "2 h 05 min ago"; a time ahead of now reads "in 5 min". */
export function ageText(at: string | Date, nowMs: number): string {
  const seconds = (nowMs - new Date(at).getTime()) / 1000
  if (!Number.isFinite(seconds)) return ''
  if (Math.abs(seconds) < 10) return 'just now'
  return seconds > 0 ? `${formatDuration(seconds)} ago` : `in ${formatDuration(-seconds)}`
}

/**
 * When a tag's trend tests last ran and how often they run (issue 12 item 5): τ and p stand still
 * between two tests, 10 min apart for a 30 s tag while a 2 s tag's move every 40 s, and a tile
 * that says so does not read as frozen. "tested 4 min ago, every 10 min".
 */
export function trendTestText(testedAt: string | null, everySeconds: number, nowMs: number): string {
  const every = `every ${formatDuration(everySeconds)}`
  return testedAt ? `tested ${ageText(testedAt, nowMs)}, ${every}` : `tested ${every}`
}
