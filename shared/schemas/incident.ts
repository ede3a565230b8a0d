import { z } from 'zod'
import { ALERT_OUTCOMES, INCIDENT_STATES, MAX_INCIDENT_WINDOW_S } from '../alarms/reviewVocabulary'
import { dbId, JSON_MAX_BYTES_PER_CHAR, textField, listLimit } from './fields'

const FINDING_MAX_CHARS = 8000
const TITLE_MAX_CHARS = 200
const FINDING_FIELDS = 4
/** Body of a findings change at its largest (every field full, every character escaped), plus room for the keys. */
export const INCIDENT_FINDINGS_MAX_BYTES = (FINDING_FIELDS * FINDING_MAX_CHARS + TITLE_MAX_CHARS) * JSON_MAX_BYTES_PER_CHAR + 1024

const findingText = textField().trim().max(FINDING_MAX_CHARS, `must have at most ${FINDING_MAX_CHARS} characters`)
const title = textField().trim().min(3, 'must have at least 3 characters').max(TITLE_MAX_CHARS, `must have at most ${TITLE_MAX_CHARS} characters`)
const alarmIds = z.array(dbId('alarm'), { required_error: 'is required (a list of alarm ids)', invalid_type_error: 'must be a list of alarm ids' })
  .min(1, 'must name at least one alarm').max(500, 'must name at most 500 alarms')
  .refine(ids => new Set(ids).size === ids.length, 'must not repeat an alarm')

export const incidentListQuerySchema = z.object({
  state: z.enum(INCIDENT_STATES, { errorMap: () => ({ message: `must be one of ${INCIDENT_STATES.join(', ')}` }) }).optional(),
  unitId: dbId('unit').optional(),
  /** The incident that holds this alarm (at most one). */
  alarmId: dbId('alarm').optional(),
  limit: listLimit(500, 200),
})
export type IncidentListQuery = z.infer<typeof incidentListQuerySchema>

/** A supervisor opens an incident by hand over alarms of one unit (taken out of any incident they were in). */
export const incidentCreateSchema = z.object({ unitId: dbId('unit'), alarmIds, title: title.optional() })
export type IncidentCreate = z.infer<typeof incidentCreateSchema>

/** Findings (what happened, cause, actions, lessons) and the title; any of them, at least one. */
export const incidentFindingsSchema = z.object({
  title: title.optional(),
  whatHappened: findingText.optional(),
  cause: findingText.optional(),
  actions: findingText.optional(),
  lessons: findingText.optional(),
}).refine(b => Object.values(b).some(v => v !== undefined), { path: ['body'], message: 'must change at least one of title, whatHappened, cause, actions, lessons' })
export type IncidentFindings = z.infer<typeof incidentFindingsSchema>

export const incidentStateSchema = z.object({
  state: z.enum(INCIDENT_STATES, { errorMap: () => ({ message: `must be one of ${INCIDENT_STATES.join(', ')}` }) }),
})

export const incidentMergeSchema = z.object({ incidentId: dbId('incident') })
export const incidentSplitSchema = z.object({ alarmIds, title: title.optional() })

export const alertOutcomeSchema = z.object({
  outcome: z.enum(ALERT_OUTCOMES, { errorMap: () => ({ message: `must be one of ${ALERT_OUTCOMES.join(', ')}` }) }).nullable(),
  note: textField().trim().max(2000, 'must have at most 2000 characters').default(''),
})

export const reviewSettingsSchema = z.object({
  siteId: dbId('site'),
  incidentWindowS: z.number({ required_error: 'is required', invalid_type_error: 'must be a number of seconds' })
    .int('must be whole seconds').min(60, 'must be at least 60').max(MAX_INCIDENT_WINDOW_S, `must be at most ${MAX_INCIDENT_WINDOW_S}`),
})

/** Tags charted on one incident timeline at most: the response stays bounded (each tag ≤ 1,000 buckets). */
export const INCIDENT_TIMELINE_MAX_TAGS = 4

/** `?tags=3,7`: the unit's tags to chart (default: the ones the incident's alarms watch). */
export const incidentTimelineQuerySchema = z.object({
  tags: z.preprocess(
    v => (typeof v === 'string' ? (v.trim() === '' ? [] : v.split(',').map(s => s.trim())) : v),
    z.array(dbId('tag'), { invalid_type_error: 'must be a comma-separated list of tag ids' })
      .max(INCIDENT_TIMELINE_MAX_TAGS, `must name at most ${INCIDENT_TIMELINE_MAX_TAGS} tags`)
      .refine(ids => new Set(ids).size === ids.length, 'must not repeat a tag'),
  ).optional(),
})
export type IncidentTimelineQuery = z.infer<typeof incidentTimelineQuerySchema>
