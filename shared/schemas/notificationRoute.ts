import { z } from 'zod'
import { ALARM_CLASSES, PRIORITIES } from '../alarms/vocabulary'
import { ROUTE_DELIVERIES, ROUTE_HOURS } from '../notifications/routeMatch'
import { ROLES } from '../utils/roles'
import { dbId, displayNameField } from './fields'

const minute = z.number({ invalid_type_error: 'must be minutes after midnight' }).int('must be whole minutes').min(0, 'must be 0 or more').max(1439, 'must be at most 1439 (23:59)')
const oneOf = <T extends readonly [string, ...string[]]>(values: T) => z.enum(values, { errorMap: () => ({ message: `must be one of ${values.join(', ')}` }) })

/** A route sends to one address or to every active user of one role, never both. */
const routeFields = z.object({
  name: displayNameField(),
  siteId: dbId('site'),
  unitId: dbId('unit').nullable().default(null),
  email: z.string().trim().toLowerCase().email('must be an e-mail address').max(254, 'is too long').nullable().default(null),
  role: oneOf(ROLES).nullable().default(null),
  minPriority: oneOf(PRIORITIES),
  alarmClasses: z.array(oneOf(ALARM_CLASSES), { invalid_type_error: 'must be a list' }).min(1, 'choose alarms, advisory alerts or both').max(2)
    .transform(list => [...new Set(list)]),
  delivery: oneOf(ROUTE_DELIVERIES).default('immediate'),
  hours: oneOf(ROUTE_HOURS).default('always'),
  workStartMinute: minute.default(420),
  workEndMinute: minute.default(1140),
  workDays: z.array(z.number().int().min(1, 'must be ISO weekdays 1-7').max(7, 'must be ISO weekdays 1-7'), { invalid_type_error: 'must be a list' })
    .min(1, 'choose at least one day').max(7).default([1, 2, 3, 4, 5]).transform(list => [...new Set(list)].sort()),
  enabled: z.boolean({ invalid_type_error: 'must be true or false' }).default(true),
}).strict()

const recipientRule = (v: { email?: string | null, role?: string | null }) => (v.email == null) !== (v.role == null)
const hoursRule = (v: { workStartMinute?: number, workEndMinute?: number }) =>
  v.workStartMinute === undefined || v.workStartMinute !== v.workEndMinute

export const routeCreateSchema = routeFields
  .refine(recipientRule, { message: 'give either an e-mail address or a role', path: ['email'] })
  .refine(hoursRule, { message: 'must differ from workStartMinute', path: ['workEndMinute'] })
export type RouteCreate = z.output<typeof routeCreateSchema>

/** A change names only the fields it changes; recipient and hours are checked again on the merged row. */
export const routeUpdateSchema = routeFields.partial().strict()
  .refine(v => Object.keys(v).length > 0, 'give at least one field to change')
export type RouteUpdate = z.output<typeof routeUpdateSchema>
export { recipientRule, hoursRule }
