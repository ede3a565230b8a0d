import { z } from 'zod'
import { dbId, textField } from './fields'
import { ALARM_CLASSES, COMPARISONS, PRIORITIES, RULE_MODES, TAG_MEASURES, TARGET_KINDS, UNIT_MEASURES } from '../alarms/vocabulary'

const id = dbId()
// ISA-18.2 rationalization: an alarm without a documented consequence, cause and operator action
// is not an alarm, so each field is required and may not be blank.
const rationale = textField({ required: 'is required (ISA-18.2 rationalization)' })
  .trim().min(1, 'must not be empty (ISA-18.2 rationalization)').max(2000, 'must have at most 2000 characters')
const seconds = z.number({ invalid_type_error: 'must be a number of seconds' }).finite().min(0, 'must be 0 or more').max(86_400, 'must be at most 86400 s (a day)')

/** ISA-18.2 rationalization also records how long the operator has to act; a week is the longest that still makes it an alarm. */
export const MAX_TIME_TO_RESPOND_S = 7 * 86_400
const timeToRespond = z.number({ required_error: 'is required (ISA-18.2 rationalization)', invalid_type_error: 'must be a number of seconds' })
  .finite().positive('must be more than 0 s').max(MAX_TIME_TO_RESPOND_S, `must be at most ${MAX_TIME_TO_RESPOND_S} s (a week)`)

const ruleFields = {
  name: textField().trim().min(2, 'must have at least 2 characters').max(120, 'must have at most 120 characters'),
  measure: z.enum(TAG_MEASURES, { errorMap: () => ({ message: `must be one of ${TAG_MEASURES.join(', ')}` }) }),
  comparison: z.enum(COMPARISONS, { errorMap: () => ({ message: 'must be above or below' }) }),
  threshold: z.number({ required_error: 'is required', invalid_type_error: 'must be a number' }).finite('must be finite'),
  onDelayS: seconds,
  offDelayS: seconds,
  deadband: z.number({ invalid_type_error: 'must be a number' }).finite().min(0, 'must be 0 or more'),
  priority: z.enum(PRIORITIES, { errorMap: () => ({ message: `must be one of ${PRIORITIES.join(', ')}` }) }),
  alarmClass: z.enum(ALARM_CLASSES, { errorMap: () => ({ message: 'must be alarm or alert' }) }),
  consequence: rationale,
  likelyCause: rationale,
  operatorAction: rationale,
  timeToRespondS: timeToRespond,
  mode: z.enum(RULE_MODES, { errorMap: () => ({ message: `must be one of ${RULE_MODES.join(', ')}` }) }),
}

export const alarmRuleCreateSchema = z.object({
  targetKind: z.enum(TARGET_KINDS, { errorMap: () => ({ message: 'must be tag or unit' }) }),
  tagId: id.optional(),
  unitId: id.optional(),
  ...ruleFields,
  onDelayS: ruleFields.onDelayS.default(0),
  offDelayS: ruleFields.offDelayS.default(0),
  deadband: ruleFields.deadband.default(0),
  mode: ruleFields.mode.default('in_service'),
}).superRefine((rule, ctx) => {
  if (rule.targetKind === 'tag' && rule.tagId === undefined)
    ctx.addIssue({ code: 'custom', path: ['tagId'], message: 'is required when targetKind is tag' })
  if (rule.targetKind === 'unit') {
    if (rule.unitId === undefined) ctx.addIssue({ code: 'custom', path: ['unitId'], message: 'is required when targetKind is unit' })
    if (rule.tagId !== undefined) ctx.addIssue({ code: 'custom', path: ['tagId'], message: 'must be left out when targetKind is unit' })
    if (!(UNIT_MEASURES as readonly string[]).includes(rule.measure))
      ctx.addIssue({ code: 'custom', path: ['measure'], message: `a unit rule can watch ${UNIT_MEASURES.join(', ')} only` })
  }
})
export type AlarmRuleCreate = z.infer<typeof alarmRuleCreateSchema>

/** The target of a rule is fixed once created; everything else may change. */
export const alarmRulePatchSchema = z.object({ ...ruleFields, enabled: z.boolean({ invalid_type_error: 'must be true or false' }) }).partial().strict()
  .refine(patch => Object.keys(patch).length > 0, { message: 'must change at least one field' })
export type AlarmRulePatch = z.infer<typeof alarmRulePatchSchema>

export const alarmRuleListQuerySchema = z.object({
  unitId: id.optional(),
  tagId: id.optional(),
  /** Disabled rules are listed only when asked for (the workbench shows them). */
  disabled: z.enum(['include', 'exclude'], { errorMap: () => ({ message: 'must be include or exclude' }) }).default('exclude'),
})

/** A rule draft to preview over past data; `ruleId` when it edits an existing rule (left out of the priority spread). */
export const alarmRulePreviewSchema = z.object({
  rule: alarmRuleCreateSchema,
  ruleId: id.optional(),
}).strict()
