// Plant-local wall-clock times → UTC, for files exported without an offset. Built on
// Intl.DateTimeFormat (the runtime's copy of the IANA tz database), no extra library.

const DAY_MS = 86_400_000
const formatters = new Map<string, Intl.DateTimeFormat>()
// Per zone: UTC day number → the zone's offsets a day before and two days after (see below).
const dayOffsets = new Map<string, Map<number, [number, number]>>()

function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone)
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit',
      hour: '2-digit', minute: '2-digit', second: '2-digit',
    })
    formatters.set(timeZone, f)
  }
  return f
}

export function isTimeZone(name: string): boolean {
  try {
    formatter(name)
    return true
  }
  catch {
    return false
  }
}

/** The zone's offset from UTC (ms, east positive) at an instant: local wall clock minus UTC. */
export function zoneOffsetMs(timeZone: string, instantMs: number): number {
  const fields: Record<string, number> = {}
  for (const p of formatter(timeZone).formatToParts(instantMs)) fields[p.type] = Number(p.value)
  const wallAsUtc = Date.UTC(fields.year!, fields.month! - 1, fields.day!, fields.hour!, fields.minute!, fields.second!)
  return wallAsUtc - Math.floor(instantMs / 1000) * 1000
}

export type LocalTimeResult =
  | { ok: true, utcMs: number }
  | { ok: false, problem: 'nonexistent' | 'ambiguous' }

/**
 * The UTC instant of a wall-clock time in `timeZone`. `wallMs` is the wall-clock reading written
 * as if it were UTC (Date.UTC of its fields). Refuses the times a clock change makes impossible
 * (skipped when clocks go forward) or ambiguous (repeated when they go back) instead of guessing.
 */
export function wallClockToUtc(wallMs: number, timeZone: string): LocalTimeResult {
  const day = Math.floor(wallMs / DAY_MS)
  let byDay = dayOffsets.get(timeZone)
  if (!byDay || byDay.size > 20_000) dayOffsets.set(timeZone, byDay = new Map())
  let offsets = byDay.get(day)
  if (!offsets) {
    // Offsets lie within ±14 h, so the instant is inside [day − 1, day + 2); if the offset is the
    // same at both ends no transition falls in between (zones never change twice in three days).
    offsets = [zoneOffsetMs(timeZone, (day - 1) * DAY_MS), zoneOffsetMs(timeZone, (day + 2) * DAY_MS)]
    byDay.set(day, offsets)
  }
  const [before, after] = offsets
  if (before === after) return { ok: true, utcMs: wallMs - before }
  const fits = [before, after].filter(o => zoneOffsetMs(timeZone, wallMs - o) === o)
  if (fits.length === 0) return { ok: false, problem: 'nonexistent' }
  if (fits.length === 2) return { ok: false, problem: 'ambiguous' }
  return { ok: true, utcMs: wallMs - fits[0]! }
}

const WALL_CLOCK = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,9}))?)?$/

/** "2026-03-29 02:30[:00[.000]]" → its fields as Date.UTC ms, or null when not such a string or not a real date. */
export function parseWallClock(text: string): number | null {
  const m = WALL_CLOCK.exec(text)
  if (!m) return null
  const [y, mo, d, h, mi, s] = m.slice(1, 7).map(f => Number(f ?? 0)) as [number, number, number, number, number, number]
  const ms = Number((m[7] ?? '0').padEnd(3, '0').slice(0, 3))
  if (mo < 1 || mo > 12 || h > 23 || mi > 59 || s > 59) return null
  const wall = Date.UTC(y, mo - 1, d, h, mi, s, ms)
  // Date.UTC rolls 2026-02-30 over into March; a real date survives the round trip.
  return new Date(wall).getUTCDate() === d ? wall : null
}
