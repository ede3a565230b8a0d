import { QUALITY_CODES, type QualityName } from './sampleQuality'
import { parseWallClock } from './zonedTime'
import { NO_NUL, NUL_MESSAGE } from '../schemas/fields'

/** One sample that passed validation: tag still by code, time as epoch milliseconds. */
export interface ValidSample { index: number, tag: string, timeMs: number, value: number, quality: number }
export interface RejectedSample { index: number, field: string, reason: string }
/** What validation needs to know of a tag: its configured instrument range. */
export interface TagBounds { rangeLow: number, rangeHigh: number }

// ISO 8601 date-time with an explicit offset: a gateway's local time without a zone is ambiguous
// twice a year, so it is refused rather than guessed. Groups: wall clock, offset.
const ISO_WITH_OFFSET = /^(\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(?::\d{2}(?:\.\d{1,9})?)?)(Z|[+-](\d{2}):?(\d{2}))$/i
/**
 * Oldest time any sample may carry, ISO or epoch: 2000-01-01. No plant history this product
 * imports predates it, and it catches epoch seconds sent as milliseconds and years like 0001 or
 * 1970 that a zeroed or unset source clock produces.
 */
export const SAMPLE_TIME_MIN_MS = Date.UTC(2000, 0, 1)
/**
 * Default for how far ahead of the receiving clock a sample may be stamped (servers may set
 * their own). A source whose clock runs fast would otherwise write "future" rows that every later,
 * correct sample sorts before. The same bound applies to uploaded files: history is in the past.
 */
export const MAX_FUTURE_SKEW_MS = 5 * 60_000
/**
 * A value further than this many range spans outside the tag's configured range is refused: no
 * transmitter reports it (a saturated one reads near its range end), so it is a corrupt or
 * sentinel value (±1e308, 9.9e37), and storing it would poison every variance that includes it.
 * Values outside the range but within the bound are stored as sent: real excursions happen.
 */
export const PHYSICAL_BOUND_SPANS = 1
/** Largest UTC offset in use anywhere (+14:00, Line Islands) [common practice]. */
const MAX_OFFSET_HOURS = 14

export interface SampleClock {
  /** The receiving clock (epoch ms). */
  nowMs: number
  /** How far ahead of it a time may be; MAX_FUTURE_SKEW_MS when not given. */
  maxFutureMs?: number
  /** Start of the site's raw window (shared/utils/rawWindow.ts); none when raw is kept indefinitely. */
  rawFromMs?: number
}

const isoText = (ms: number) => new Date(ms).toISOString().replace('.000Z', 'Z')

/** Epoch ms of an ISO 8601 string with offset, or why it is not a real instant. */
function parseIso(raw: string): number | string {
  const m = ISO_WITH_OFFSET.exec(raw)
  if (!m) return 'must be ISO 8601 with a time-zone offset, e.g. 2026-05-01T12:00:00Z'
  // Date.parse would roll 2026-02-30 over into 2 March: check the calendar fields first.
  const wall = parseWallClock(m[1]!.replace(/t/i, 'T'))
  if (wall === null) return `${raw} is not a real date and time (day, month, hour, minute or second out of range)`
  if (m[3] !== undefined && (Number(m[3]) > MAX_OFFSET_HOURS || Number(m[4]) > 59)) return `${raw} has an offset beyond ±${MAX_OFFSET_HOURS}:00`
  const ms = Date.parse(raw)
  return Number.isNaN(ms) ? `${raw} is not a valid date` : ms
}

/** A sample time → epoch ms, or why it is refused (format, calendar, plausibility, clock skew). */
export function parseSampleTime(raw: unknown, clock: SampleClock): number | string {
  let ms: number
  if (typeof raw === 'number') {
    if (!Number.isFinite(raw)) return 'must be a finite number of epoch milliseconds'
    ms = raw
  }
  else if (typeof raw === 'string') {
    const parsed = parseIso(raw)
    if (typeof parsed === 'string') return parsed
    ms = parsed
  }
  else return 'must be an ISO 8601 string with offset or epoch milliseconds'
  if (ms < SAMPLE_TIME_MIN_MS) {
    return typeof raw === 'number' && raw > 0 && raw * 1000 >= SAMPLE_TIME_MIN_MS
      ? `epoch milliseconds ${raw} is before 2000-01-01 (seconds sent instead of milliseconds?)`
      : `is before 2000-01-01, the earliest plausible sample time`
  }
  if (clock.rawFromMs !== undefined && ms < clock.rawFromMs) {
    return `${isoText(ms)} is older than this site's raw window (raw samples are kept from ${isoText(clock.rawFromMs)}): `
      + 'that time is already folded into the per-minute archive'
  }
  const maxFuture = clock.maxFutureMs ?? MAX_FUTURE_SKEW_MS
  if (ms > clock.nowMs + maxFuture) {
    const ahead = ms - clock.nowMs
    const text = ahead < 48 * 3_600_000 ? `${Math.round(ahead / 60_000)} min` : `${Math.round(ahead / 86_400_000)} days`
    return `${isoText(ms)} is ${text} ahead of the receiving clock (allowed: ${Math.round(maxFuture / 1000)} s of clock skew): the source's clock is fast or the time is wrong`
  }
  return ms
}

function parseQuality(raw: unknown): number | string {
  if (raw === undefined || raw === null) return QUALITY_CODES.good
  if (typeof raw === 'string' && raw in QUALITY_CODES) return QUALITY_CODES[raw as QualityName]
  if (typeof raw === 'number' && [0, 1, 2].includes(raw)) return raw
  return 'must be good, uncertain or bad (or 0, 1, 2)'
}

/** Why a value is refused for a tag, or null when it may be stored. */
export function valueProblem(value: unknown, tag: TagBounds): string | null {
  if (typeof value !== 'number' || !Number.isFinite(value)) return 'must be a finite number'
  const span = Math.abs(tag.rangeHigh - tag.rangeLow)
  const low = Math.min(tag.rangeLow, tag.rangeHigh) - PHYSICAL_BOUND_SPANS * span
  const high = Math.max(tag.rangeLow, tag.rangeHigh) + PHYSICAL_BOUND_SPANS * span
  if (span > 0 && (value < low || value > high))
    return `${value} is beyond the physical bound of this tag (range ${tag.rangeLow}–${tag.rangeHigh}; refused outside ${low}–${high})`
  return null
}

/**
 * Checks each sample of a batch on its own, so one bad reading never costs the good ones.
 * `tagOf` gives a tag's bounds by code for the sender's site (undefined: unknown tag). Times are
 * checked against the receiving clock: nothing beyond its skew allowance, nothing before 2000.
 */
export function validateSamples(items: readonly unknown[], tagOf: (code: string) => TagBounds | undefined, clock: SampleClock) {
  const valid: ValidSample[] = []
  const rejected: RejectedSample[] = []
  items.forEach((item, index) => {
    const reject = (field: string, reason: string) => rejected.push({ index, field, reason })
    if (typeof item !== 'object' || item === null || Array.isArray(item)) return reject('sample', 'must be an object {tag, time, value, quality?}')
    const { tag, time, value, quality } = item as Record<string, unknown>
    if (typeof tag !== 'string' || !tag.trim()) return reject('tag', 'is required (the tag code, e.g. TI-101)')
    if (!NO_NUL.test(tag)) return reject('tag', NUL_MESSAGE)
    const bounds = tagOf(tag.trim())
    if (!bounds) return reject('tag', `unknown tag code ${JSON.stringify(tag.trim())} for this gateway's site`)
    const timeMs = parseSampleTime(time, clock)
    if (typeof timeMs === 'string') return reject('time', timeMs)
    const problem = valueProblem(value, bounds)
    if (problem) return reject('value', problem)
    const q = parseQuality(quality)
    if (typeof q === 'string') return reject('quality', q)
    valid.push({ index, tag: tag.trim(), timeMs, value: value as number, quality: q })
  })
  return { valid, rejected }
}
