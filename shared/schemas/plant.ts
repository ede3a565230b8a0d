import { z } from 'zod'
import { dbId as id, textField } from './fields'
import { LOOP_ROLES } from '../plant/vocabulary'
import { isTimeZone } from '../utils/zonedTime'

// Contracts of the plant-model screens and routes (sites, units, tags): one schema for form and route.

export const MAX_SAMPLE_PERIOD_S = 86_400

/**
 * ISA-5.1 instrument identification: functional letters (first letter the measured or initiating
 * variable, then readout/output letters), then the loop number, with an optional area prefix and
 * suffix letter: TI-101, FIC-2301, 10-PT-205A [common practice].
 */
export const TAG_CODE_PATTERN = /^(?:\d{1,4}-)?[A-Z]{1,5}-?\d{1,6}[A-Z]?$/
const PLANT_CODE_PATTERN = /^[A-Z0-9][A-Z0-9_-]{0,19}$/

const text = (min: number, max: number) => textField().trim()
  .min(min, min === 1 ? 'must not be empty' : `must have at least ${min} characters`).max(max, `must have at most ${max} characters`)
const plantCode = textField().trim().toUpperCase()
  .regex(PLANT_CODE_PATTERN, 'must be 1–20 capital letters, digits, - or _ (e.g. R-100)')
const number = (message = 'must be a number') => z.number({ required_error: 'is required', invalid_type_error: message }).finite('must be finite')

export const siteFields = {
  code: plantCode,
  name: text(2, 120),
  company: text(2, 120),
  timeZone: textField().trim()
    .refine(isTimeZone, 'must be an IANA time-zone name such as Europe/London'),
}
export const siteCreateSchema = z.object(siteFields)
export const sitePatchSchema = z.object(siteFields).partial().strict()
  .refine(p => Object.keys(p).length > 0, { message: 'must change at least one field' })
export type SiteCreate = z.infer<typeof siteCreateSchema>
export type SitePatch = z.infer<typeof sitePatchSchema>

export const unitFields = {
  code: plantCode,
  name: text(2, 120),
  kind: text(2, 60),
  description: text(0, 2000).default(''),
}
export const unitCreateSchema = z.object({ siteId: id('site'), ...unitFields })
export const unitPatchSchema = z.object({ ...unitFields, description: text(0, 2000) }).partial().strict()
  .refine(p => Object.keys(p).length > 0, { message: 'must change at least one field' })
export type UnitCreate = z.infer<typeof unitCreateSchema>
export type UnitPatch = z.infer<typeof unitPatchSchema>

const tagFields = {
  unitId: id('unit'),
  code: textField().trim().toUpperCase()
    .regex(TAG_CODE_PATTERN, 'must be an ISA-5.1 style code: letters, then the loop number (e.g. TI-101, FIC-2301)'),
  description: text(2, 200),
  engineeringUnit: text(1, 20),
  samplePeriodS: number('must be a number of seconds').positive('must be more than 0 s').max(MAX_SAMPLE_PERIOD_S, `must be at most ${MAX_SAMPLE_PERIOD_S} s (a day)`),
  rangeLow: number(),
  rangeHigh: number(),
  noiseFloor: number().min(0, 'must be 0 or more'),
  quantisationStep: number().min(0, 'must be 0 or more (0: not quantised)'),
  /** The tag whose loop this one belongs to; null for none. */
  loopTagId: id('tag').nullable(),
  loopRole: z.enum(LOOP_ROLES, { errorMap: () => ({ message: `must be one of ${LOOP_ROLES.join(', ')}` }) }).nullable(),
}

type TagShape = Partial<{
  rangeLow: number, rangeHigh: number, noiseFloor: number, quantisationStep: number,
  loopTagId: number | null, loopRole: string | null
}>

/** Checks across fields; on an edit the server runs them again on the tag as it would become. */
export function tagCrossIssues(tag: TagShape): { field: string, message: string }[] {
  const issues: { field: string, message: string }[] = []
  const span = tag.rangeLow !== undefined && tag.rangeHigh !== undefined ? tag.rangeHigh - tag.rangeLow : undefined
  if (span !== undefined && !(span > 0)) issues.push({ field: 'rangeHigh', message: 'must be above the range low' })
  if (span !== undefined && span > 0 && tag.noiseFloor !== undefined && tag.noiseFloor >= span)
    issues.push({ field: 'noiseFloor', message: 'must be smaller than the range span' })
  if (span !== undefined && span > 0 && tag.quantisationStep !== undefined && tag.quantisationStep >= span)
    issues.push({ field: 'quantisationStep', message: 'must be smaller than the range span' })
  if (tag.loopTagId !== undefined && tag.loopRole !== undefined && (tag.loopTagId === null) !== (tag.loopRole === null))
    issues.push({ field: tag.loopTagId === null ? 'loopTagId' : 'loopRole', message: 'is required when the other loop field is set' })
  return issues
}

function tagCrossChecks(tag: TagShape, ctx: z.RefinementCtx) {
  for (const issue of tagCrossIssues(tag)) ctx.addIssue({ code: 'custom', path: [issue.field], message: issue.message })
}

export const tagCreateSchema = z.object({
  ...tagFields,
  noiseFloor: tagFields.noiseFloor.default(0),
  quantisationStep: tagFields.quantisationStep.default(0),
  loopTagId: tagFields.loopTagId.default(null),
  loopRole: tagFields.loopRole.default(null),
}).superRefine(tagCrossChecks)
export type TagCreate = z.infer<typeof tagCreateSchema>

/** The code and the unit may change (history follows the tag id); the site follows the unit. */
export const tagPatchSchema = z.object(tagFields).partial().strict()
  .superRefine((p, ctx) => {
    if (Object.keys(p).length === 0) ctx.addIssue({ code: 'custom', path: [], message: 'must change at least one field' })
    tagCrossChecks(p, ctx)
  })
export type TagPatch = z.infer<typeof tagPatchSchema>

export const plantListQuerySchema = z.object({
  /** Retired rows are listed only when asked for. */
  retired: z.enum(['include', 'exclude'], { errorMap: () => ({ message: 'must be include or exclude' }) }).default('exclude'),
})
