import { wallClockText } from '#shared/utils/timeText'
import { parseWallClock, wallClockToUtc } from '#shared/utils/zonedTime'

/**
 * A time typed on the plant's wall clock ("2026-12-02 14:00"), in the year-month-day order every
 * table shows (a browser's date picker follows the browser's locale instead, month first in en-US),
 * as an ISO instant, or why it cannot be one. Empty text is no time.
 */
export function plantTimeFromInput(text: string, timeZone: string): { iso: string | undefined } | { error: string } {
  const trimmed = text.trim()
  if (!trimmed) return { iso: undefined }
  const wall = parseWallClock(trimmed)
  if (wall === null) return { error: `“${trimmed}” is not a date and time such as 2026-12-02 14:00` }
  const utc = wallClockToUtc(wall, timeZone)
  if (utc.ok) return { iso: new Date(utc.utcMs).toISOString() }
  return { error: utc.problem === 'nonexistent' ? `${trimmed} does not exist in ${timeZone} (the clocks went forward)` : `${trimmed} happens twice in ${timeZone} (the clocks went back)` }
}

/** An ISO instant as the input shows it: minutes on the plant's wall clock. */
export const plantTimeToInput = (iso: string | undefined, timeZone: string) => (iso ? wallClockText(iso, timeZone).slice(0, 16) : '')
