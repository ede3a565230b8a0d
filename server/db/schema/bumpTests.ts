import { sql } from 'drizzle-orm'
import { pgTable, serial, integer, doublePrecision, timestamp, text, index, check } from 'drizzle-orm/pg-core'
import { tags } from './plant'
import { users } from './users'

// Deliberate small steps an engineer made on a tag, with the exponential recovery fitted to the
// response (shared/analysis/bumpTest.ts) and the passive estimate of the same rate at that time.
export const bumpTests = pgTable('bump_tests', {
  id: serial('id').primaryKey(),
  tagId: integer('tag_id').notNull().references(() => tags.id, { onDelete: 'cascade' }),
  stepTime: timestamp('step_time', { withTimezone: true }).notNull(),
  /** Size of the step in the tag's engineering unit (signed). */
  stepSize: doublePrecision('step_size').notNull(),
  /** How long after the step the response is fitted. */
  responseS: doublePrecision('response_s').notNull(),
  note: text('note').notNull().default(''),
  recordedAt: timestamp('recorded_at', { withTimezone: true }).notNull().defaultNow(),
  recordedBy: integer('recorded_by').references(() => users.id, { onDelete: 'set null' }),
  /** null until fitted; 'fit' or 'no fit' (with the reason). */
  fitStatus: text('fit_status'),
  fitReason: text('fit_reason'),
  rate: doublePrecision('rate'),
  rateSe: doublePrecision('rate_se'),
  residualSd: doublePrecision('residual_sd'),
  initialValue: doublePrecision('initial_value'),
  finalValue: doublePrecision('final_value'),
  /** Recovery rate from the indicators (lag-1 autocorrelation) nearest before the step, and its SE. */
  passiveRate: doublePrecision('passive_rate'),
  passiveRateSe: doublePrecision('passive_rate_se'),
  fittedAt: timestamp('fitted_at', { withTimezone: true }),
}, t => [
  index('bump_tests_tag').on(t.tagId, t.stepTime),
  check('bump_tests_values', sql`${t.stepSize} <> 0 and ${t.responseS} > 0`),
  check('bump_tests_fit_status', sql`${t.fitStatus} is null or ${t.fitStatus} in ('fit', 'no fit')`),
])
