import { QUALITY_CODES, type QualityName } from './sampleQuality'

/** One sample that passed validation: tag still by code, time as epoch milliseconds. */
export interface ValidSample { index: number, tag: string, timeMs: number, value: number, quality: number }
export interface RejectedSample { index: number, field: string, reason: string }

// ISO 8601 date-time with an explicit offset: a gateway's local time without a zone is ambiguous
// twice a year, so it is refused rather than guessed.
const ISO_WITH_OFFSET = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?(Z|[+-]\d{2}:?\d{2})$/i
// Plausibility bounds for epoch milliseconds: 2000-01-01 … 2100-01-01 catches seconds-vs-ms mix-ups.
const EPOCH_MS_MIN = Date.UTC(2000, 0, 1)
const EPOCH_MS_MAX = Date.UTC(2100, 0, 1)
/**
 * How far ahead of the receiving clock a live sample may be stamped. A source whose clock runs
 * minutes fast would otherwise write "future" rows that every later, correct sample sorts before.
 */
export const MAX_FUTURE_SKEW_MS = 5 * 60_000

function parseTime(raw: unknown): number | string {
  if (typeof raw === 'number') {
    if (!Number.isFinite(raw)) return 'must be a finite number of epoch milliseconds'
    if (raw < EPOCH_MS_MIN || raw > EPOCH_MS_MAX) return 'epoch milliseconds out of range 2000–2100 (seconds sent instead of milliseconds?)'
    return raw
  }
  if (typeof raw !== 'string') return 'must be an ISO 8601 string with offset or epoch milliseconds'
  if (!ISO_WITH_OFFSET.test(raw)) return 'must be ISO 8601 with a time-zone offset, e.g. 2026-05-01T12:00:00Z'
  const ms = Date.parse(raw)
  return Number.isNaN(ms) ? 'is not a valid date' : ms
}

function parseQuality(raw: unknown): number | string {
  if (raw === undefined || raw === null) return QUALITY_CODES.good
  if (typeof raw === 'string' && raw in QUALITY_CODES) return QUALITY_CODES[raw as QualityName]
  if (typeof raw === 'number' && [0, 1, 2].includes(raw)) return raw
  return 'must be good, uncertain or bad (or 0, 1, 2)'
}

/**
 * Checks each sample of a batch on its own, so one bad reading never costs the good ones.
 * `knownTag` says whether a tag code exists for the sender's site. With `nowMs` (live data), a
 * time more than MAX_FUTURE_SKEW_MS ahead of it is refused as clock skew.
 */
export function validateSamples(items: readonly unknown[], knownTag: (code: string) => boolean, options: { nowMs?: number } = {}) {
  const valid: ValidSample[] = []
  const rejected: RejectedSample[] = []
  items.forEach((item, index) => {
    const reject = (field: string, reason: string) => rejected.push({ index, field, reason })
    if (typeof item !== 'object' || item === null || Array.isArray(item)) return reject('sample', 'must be an object {tag, time, value, quality?}')
    const { tag, time, value, quality } = item as Record<string, unknown>
    if (typeof tag !== 'string' || !tag.trim()) return reject('tag', 'is required (the tag code, e.g. TI-101)')
    if (!knownTag(tag.trim())) return reject('tag', `unknown tag code ${JSON.stringify(tag.trim())} for this gateway's site`)
    const timeMs = parseTime(time)
    if (typeof timeMs === 'string') return reject('time', timeMs)
    if (options.nowMs !== undefined && timeMs > options.nowMs + MAX_FUTURE_SKEW_MS)
      return reject('time', `is ${Math.round((timeMs - options.nowMs) / 60_000)} min ahead of the receiving clock (more than ${MAX_FUTURE_SKEW_MS / 60_000} min): the source's clock is fast`)
    if (typeof value !== 'number' || !Number.isFinite(value)) return reject('value', 'must be a finite number')
    const q = parseQuality(quality)
    if (typeof q === 'string') return reject('quality', q)
    valid.push({ index, tag: tag.trim(), timeMs, value, quality: q })
  })
  return { valid, rejected }
}
