import { z } from 'zod'
import { parseWallClock } from '../utils/zonedTime'

// Field types every contract shares, so a bound that protects the database holds on every route.

/**
 * Largest id a row can have: ids are PostgreSQL `integer` (serial) columns, 2^31 − 1. A larger
 * number (2^31, 2^63, 1e20) would make the database fail the query ("out of range for type
 * integer") instead of answering, so it is refused here as a bad id.
 */
export const MAX_DB_ID = 2_147_483_647

/** A row id from a path, query or body ("12" or 12); `what` names the row in the message. */
export const dbId = (what?: string) => {
  const message = what ? `must be a ${what} id` : 'must be a positive id'
  return z.coerce.number({ invalid_type_error: what ? message : 'must be a number' })
    .int(message).positive(message).max(MAX_DB_ID, `${message} (at most ${MAX_DB_ID})`)
}

/** How many rows a list answers: `?limit=`, 1 to `max`, `fallback` when left out. */
export const listLimit = (max: number, fallback: number) => z.coerce.number({ invalid_type_error: 'must be a number' })
  .int('must be a whole number').min(1, 'must be at least 1').max(max, `must be at most ${max}`).default(fallback)

/** The `:id` of a route's path. */
export const idParamsSchema = z.object({ id: dbId() })

/**
 * Text of any field. PostgreSQL refuses U+0000 in text values, and no form or gateway has a reason
 * to send it, so it is refused here with the field named instead of failing the write.
 */
// eslint-disable-next-line no-control-regex -- matching the NUL character is the point of this check
export const NO_NUL = /^[^\u0000]*$/
export const NUL_MESSAGE = 'must not contain a NUL character (U+0000)'
/**
 * Most bytes one character of text can take in a JSON body: a control character is written as a
 * six-byte \u escape (RFC 8259 §7); any other UTF-16 unit takes at most 3 bytes of UTF-8. Body
 * limits for routes with long text fields are sized from it (server/utils/bodyLimits.ts).
 */
export const JSON_MAX_BYTES_PER_CHAR = 6
export const textField = (messages: { required?: string, type?: string } = {}) =>
  z.string({ required_error: messages.required ?? 'is required', invalid_type_error: messages.type ?? 'must be text' })
    .regex(NO_NUL, NUL_MESSAGE)

/**
 * A person's or a route's name as lists show it: one line, 2–80 characters. A control character
 * (tab, line feed, escape) would break the one-line tables and mail headers it appears in.
 */
// eslint-disable-next-line no-control-regex -- matching control characters is the point of this check
const CONTROL_CHARACTER = /[\u0000-\u001f]/
export const displayNameField = () => textField().trim()
  .min(2, 'must have at least 2 characters').max(80, 'must have at most 80 characters')
  .refine(s => !CONTROL_CHARACTER.test(s), 'must not contain control characters')

const LEADING_DATE = /^\s*(\d{4})-(\d{2})-(\d{2})(?!\d)/
export const CALENDAR_MESSAGE = 'must be a real calendar date (day or month out of range)'

/**
 * Whether text starting YYYY-MM-DD names a day the calendar lacks. JavaScript's Date rolls
 * 2026-02-30 over into 2 March and 2026-04-31 into 1 May instead of refusing them, so the
 * calendar fields are checked before it reads the text (the same check as plant-local times).
 */
export function isImpossibleCalendarDate(value: unknown): boolean {
  if (typeof value !== 'string') return false
  const m = LEADING_DATE.exec(value)
  return m !== null && parseWallClock(`${m[1]}-${m[2]}-${m[3]} 00:00`) === null
}

/**
 * A time in a query or body (ISO 8601). JavaScript reads years past 9999 ("10000-01-01"), but
 * their ISO text (+010000-…) is not one the database reads, so they are refused like any
 * unreadable time; so is a day the calendar lacks, which JavaScript would silently move.
 */
export const timeField = () => z.unknown()
  .superRefine((v, ctx) => { if (isImpossibleCalendarDate(v)) ctx.addIssue({ code: 'custom', message: CALENDAR_MESSAGE }) })
  .pipe(z.coerce.date({ errorMap: () => ({ message: 'must be an ISO 8601 time' }) })
    .refine(d => d.getUTCFullYear() >= 1 && d.getUTCFullYear() <= 9999, 'must be a time in the years 1 to 9999'))

/**
 * An instant that names its zone: ISO 8601 ending in Z or an offset. A time without one would be
 * read in the server's zone, which is not the plant's and shifts twice a year; ingest refuses
 * zone-less times for the same reason.
 */
const WITH_OFFSET = /(?:Z|[+-]\d{2}:?\d{2})$/i
export const zonedTimeField = () => textField().trim()
  // Fatal: a failed check must stop here, or the refinements after the pipe would see the string.
  .superRefine((s, ctx) => {
    if (!WITH_OFFSET.test(s))
      ctx.addIssue({ code: 'custom', fatal: true, message: 'must name its time-zone offset, e.g. 2026-05-01T12:00:00Z or 2026-05-01T14:00:00+02:00' })
  })
  .pipe(timeField())
