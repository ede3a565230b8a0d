// Kinds of bad input, one row each: what a careless form, script or gateway sends (issue 13 items
// 2, 3 and 10). tests/e2e/badInputKinds.test.ts sends each and checks the answer is the status
// given, names the field (`field: reason` in the message, as server/utils/validation.ts writes
// it) and that no row anywhere was added, removed or changed.
//
// Sources for the bounds checked: ISA-18.2-2016 rationalization (consequence, cause, action and
// time to respond recorded per alarm) and §11 shelving (time-limited) [from memory]; ISA-5.1
// instrument identification for tag codes [common practice]; ISO 8601-1:2019 for times (a time
// of day without an offset is local time of unknown zone; calendar dates have 28–31 days)
// [from memory]; RFC 8259 §6 (JSON numbers: an out-of-range literal such as 1e309 is what the
// parser makes of it, here Infinity) [from memory]; RFC 9110 §15.5.16 (415 Unsupported Media
// Type) [from memory]; NIST SP 800-63B-4 §3.1.1.2 (password length) [from memory]; the IANA
// time-zone database for zone names [common practice].
import type { Role } from '../../shared/utils/roles'

/** Rows the cases point at, looked up once the demo site is seeded. */
export interface Fixtures {
  siteId: number
  unitId: number
  tagId: number
  ruleId: number
  routeId: number
  gatewayId: number
  userId: number
}

export interface BadInputKind {
  kind: string
  /** Who sends it; 'gateway' uses the demo simulator's key, 'anonymous' nothing. */
  as: Role | 'gateway' | 'anonymous'
  method: 'GET' | 'POST' | 'PUT' | 'PATCH'
  path: (f: Fixtures) => string
  /** A JSON body (sent with Content-Type: application/json). */
  json?: (f: Fixtures) => unknown
  /** A raw body and its type, for what JSON.stringify cannot write. */
  raw?: { type: string, body: string }
  status: number
  /** The field the answer must name, as `field:`. */
  field: string
  /** A word the answer must also hold (the key named by a strict object's refusal). */
  mentions?: string
  /**
   * Tables that count the refusal by design and so do change: a gateway's refused batches are
   * counted on it (failed_batch_count, last_error) for the admin's gateway list.
   */
  countedIn?: string[]
}

const long = (n: number) => 'x'.repeat(n)
const iso = (msFromNow: number) => new Date(Date.now() + msFromNow).toISOString()
const HOUR = 3_600_000

const site = { code: 'PRB-SITE', name: 'Probe site', company: 'Probe Co', timeZone: 'Europe/London' }
const unit = (f: Fixtures) => ({ siteId: f.siteId, code: 'PRB-U1', name: 'Probe unit', kind: 'probe' })
const tag = (f: Fixtures) => ({
  unitId: f.unitId, code: 'TI-9902', description: 'Probe tag', engineeringUnit: 'K', samplePeriodS: 1, rangeLow: 0, rangeHigh: 100,
})
const rule = (f: Fixtures) => ({
  targetKind: 'tag', tagId: f.tagId, name: 'Probe rule', measure: 'value', comparison: 'above', threshold: 1,
  priority: 'low', alarmClass: 'alarm', timeToRespondS: 60,
  consequence: 'Probe consequence.', likelyCause: 'Probe cause.', operatorAction: 'Probe action.',
})
const route = (f: Fixtures) => ({ name: 'Probe route', siteId: f.siteId, email: 'probe@example.com', minPriority: 'low', alarmClasses: ['alarm'] })
const user = { email: 'probe.user@example.com', name: 'Probe User', role: 'operator' }
const settings = {
  windowSamples: 300, detrendBandwidthS: 50, trendWindowSamples: 1200, minTrendSamples: 200,
  indicatorStep: 10, evaluateEvery: 20, surrogates: 99, alpha: 0.0025,
}
const GATEWAY_COUNTERS = ['gateways', 'gateway_hourly']
const without = <T extends object>(o: T, key: keyof T) => Object.fromEntries(Object.entries(o).filter(([k]) => k !== key))

export const BAD_INPUT_KINDS: BadInputKind[] = [
  // Sites, units and tags (the plant model).
  { kind: 'site code with spaces and punctuation', as: 'engineer', method: 'POST', path: () => '/api/sites', json: () => ({ ...site, code: 'bad code!' }), status: 400, field: 'code' },
  { kind: 'time zone that is not an IANA name', as: 'engineer', method: 'POST', path: () => '/api/sites', json: () => ({ ...site, timeZone: 'Mars/Olympus_Mons' }), status: 400, field: 'timeZone' },
  { kind: 'UTC offset given as a time zone', as: 'engineer', method: 'POST', path: () => '/api/sites', json: () => ({ ...site, timeZone: '+02:00' }), status: 400, field: 'timeZone' },
  { kind: 'name of one character', as: 'engineer', method: 'POST', path: () => '/api/sites', json: () => ({ ...site, name: 'A' }), status: 400, field: 'name' },
  { kind: 'name past its length limit', as: 'engineer', method: 'POST', path: () => '/api/sites', json: () => ({ ...site, company: long(121) }), status: 400, field: 'company' },
  { kind: 'change that changes nothing', as: 'engineer', method: 'PATCH', path: f => `/api/sites/${f.siteId}`, json: () => ({}), status: 400, field: 'body' },
  { kind: 'change to a field that does not exist', as: 'engineer', method: 'PATCH', path: f => `/api/sites/${f.siteId}`, json: () => ({ colour: 'red' }), status: 400, field: 'body', mentions: 'colour' },
  { kind: 'required text left out', as: 'engineer', method: 'POST', path: () => '/api/units', json: f => without(unit(f), 'kind'), status: 400, field: 'kind' },
  { kind: 'text sent as a number', as: 'engineer', method: 'POST', path: () => '/api/units', json: f => ({ ...unit(f), name: 12345 }), status: 400, field: 'name' },
  { kind: 'description past 2000 characters', as: 'engineer', method: 'PATCH', path: f => `/api/units/${f.unitId}`, json: () => ({ description: long(2001) }), status: 400, field: 'description' },
  { kind: 'site id of 0', as: 'engineer', method: 'POST', path: () => '/api/units', json: f => ({ ...unit(f), siteId: 0 }), status: 400, field: 'siteId' },
  { kind: 'negative id', as: 'engineer', method: 'POST', path: () => '/api/units', json: f => ({ ...unit(f), siteId: -3 }), status: 400, field: 'siteId' },
  { kind: 'fractional id', as: 'engineer', method: 'POST', path: () => '/api/units', json: f => ({ ...unit(f), siteId: 1.5 }), status: 400, field: 'siteId' },
  { kind: 'id in the path that is not a number', as: 'engineer', method: 'PATCH', path: () => '/api/units/abc', json: () => ({ name: 'Probe unit' }), status: 400, field: 'id' },
  { kind: 'tag code not in ISA-5.1 form', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), code: 'temperature sensor' }), status: 400, field: 'code' },
  { kind: 'sample period of 0 s', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), samplePeriodS: 0 }), status: 400, field: 'samplePeriodS' },
  { kind: 'sample period longer than a day', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), samplePeriodS: 86_401 }), status: 400, field: 'samplePeriodS' },
  { kind: 'number sent as text', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), samplePeriodS: '1' }), status: 400, field: 'samplePeriodS' },
  { kind: 'range high below range low', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), rangeLow: 100, rangeHigh: 0 }), status: 400, field: 'rangeHigh' },
  { kind: 'empty range (high equals low)', as: 'engineer', method: 'PATCH', path: f => `/api/tags/${f.tagId}`, json: () => ({ rangeLow: 5, rangeHigh: 5 }), status: 400, field: 'rangeHigh' },
  { kind: 'negative noise floor', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), noiseFloor: -0.1 }), status: 400, field: 'noiseFloor' },
  { kind: 'noise floor as wide as the range', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), noiseFloor: 100 }), status: 400, field: 'noiseFloor' },
  { kind: 'loop role without its loop tag', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), loopRole: 'setpoint' }), status: 400, field: 'loopTagId' },
  { kind: 'loop role outside the list', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), loopTagId: f.tagId, loopRole: 'boss' }), status: 400, field: 'loopRole' },
  {
    kind: 'number literal beyond double range (1e309 reads as Infinity)', as: 'engineer', method: 'POST', path: () => '/api/tags',
    raw: { type: 'application/json', body: '{"unitId":1,"code":"TI-9902","description":"Probe tag","engineeringUnit":"K","samplePeriodS":1,"rangeLow":0,"rangeHigh":1e309}' },
    status: 400, field: 'rangeHigh',
  },
  { kind: 'null for a required number', as: 'engineer', method: 'POST', path: () => '/api/tags', json: f => ({ ...tag(f), rangeLow: null }), status: 400, field: 'rangeLow' },

  // Alarm rules (ISA-18.2 rationalization).
  { kind: 'rule without its consequence', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => without(rule(f), 'consequence'), status: 400, field: 'consequence' },
  { kind: 'operator action of blanks only', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => ({ ...rule(f), operatorAction: '   ' }), status: 400, field: 'operatorAction' },
  { kind: 'comparison outside the list', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => ({ ...rule(f), comparison: 'equals' }), status: 400, field: 'comparison' },
  { kind: 'priority outside the list', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => ({ ...rule(f), priority: 'critical' }), status: 400, field: 'priority' },
  { kind: 'threshold sent as text', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => ({ ...rule(f), threshold: '100' }), status: 400, field: 'threshold' },
  { kind: 'negative on-delay', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => ({ ...rule(f), onDelayS: -5 }), status: 400, field: 'onDelayS' },
  { kind: 'time to respond longer than a week', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => ({ ...rule(f), timeToRespondS: 7 * 86_400 + 1 }), status: 400, field: 'timeToRespondS' },
  { kind: 'tag rule without its tag', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => without(rule(f), 'tagId'), status: 400, field: 'tagId' },
  { kind: 'unit rule that also names a tag', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => ({ ...rule(f), targetKind: 'unit', unitId: f.unitId, measure: 'recovery_rate' }), status: 400, field: 'tagId' },
  { kind: 'unit rule on a tag-only measure', as: 'engineer', method: 'POST', path: () => '/api/rules', json: f => ({ ...without(rule(f), 'tagId'), targetKind: 'unit', unitId: f.unitId }), status: 400, field: 'measure' },
  { kind: 'true/false sent as a word', as: 'engineer', method: 'PATCH', path: f => `/api/rules/${f.ruleId}`, json: () => ({ enabled: 'yes' }), status: 400, field: 'enabled' },
  { kind: 'list filter outside its choices', as: 'engineer', method: 'GET', path: () => '/api/rules?disabled=maybe', status: 400, field: 'disabled' },

  // Indicator settings.
  { kind: 'window below its minimum', as: 'engineer', method: 'PUT', path: f => `/api/tags/${f.tagId}/indicator-settings`, json: () => ({ settings: { ...settings, windowSamples: 5 } }), status: 400, field: 'settings.windowSamples' },
  { kind: 'trend window not longer than the indicator window', as: 'engineer', method: 'PUT', path: f => `/api/tags/${f.tagId}/indicator-settings`, json: () => ({ settings: { ...settings, trendWindowSamples: 300 } }), status: 400, field: 'settings.trendWindowSamples' },
  { kind: 'significance level of 0', as: 'engineer', method: 'PUT', path: f => `/api/tags/${f.tagId}/indicator-settings`, json: () => ({ settings: { ...settings, alpha: 0 } }), status: 400, field: 'settings.alpha' },
  { kind: 'whole number given with a fraction', as: 'engineer', method: 'PUT', path: f => `/api/tags/${f.tagId}/indicator-settings`, json: () => ({ settings: { ...settings, surrogates: 99.5 } }), status: 400, field: 'settings.surrogates' },
  { kind: 'preview range outside its choices', as: 'engineer', method: 'POST', path: f => `/api/tags/${f.tagId}/indicator-settings/preview`, json: () => ({ settings, range: '7d' }), status: 400, field: 'range' },

  // Bump tests.
  { kind: 'step of size 0', as: 'engineer', method: 'POST', path: f => `/api/tags/${f.tagId}/bump-tests`, json: () => ({ stepTime: '2026-01-01 10:00:00', stepSize: 0, responseS: 60 }), status: 400, field: 'stepSize' },
  { kind: 'wall-clock time on a day the calendar lacks', as: 'engineer', method: 'POST', path: f => `/api/tags/${f.tagId}/bump-tests`, json: () => ({ stepTime: '2026-02-30 10:00:00', stepSize: 1, responseS: 60 }), status: 400, field: 'stepTime' },
  { kind: 'hour 25', as: 'engineer', method: 'POST', path: f => `/api/tags/${f.tagId}/bump-tests`, json: () => ({ stepTime: '2026-01-01 25:00:00', stepSize: 1, responseS: 60 }), status: 400, field: 'stepTime' },
  { kind: 'response longer than a day', as: 'engineer', method: 'POST', path: f => `/api/tags/${f.tagId}/bump-tests`, json: () => ({ stepTime: '2026-01-01 10:00:00', stepSize: 1, responseS: 86_401 }), status: 400, field: 'responseS' },
  { kind: 'tag series range outside its choices', as: 'operator', method: 'GET', path: f => `/api/tags/${f.tagId}/series?range=2y`, status: 400, field: 'range' },

  // Alarms: acknowledge, shelve, list.
  { kind: 'acknowledging an empty list', as: 'operator', method: 'POST', path: () => '/api/alarms/acknowledge', json: () => ({ ids: [] }), status: 400, field: 'ids' },
  { kind: 'the same alarm twice in one list', as: 'operator', method: 'POST', path: () => '/api/alarms/acknowledge', json: () => ({ ids: [7, 7] }), status: 400, field: 'ids' },
  { kind: 'a list past its length limit', as: 'operator', method: 'POST', path: () => '/api/alarms/acknowledge', json: () => ({ ids: Array.from({ length: 201 }, (_, i) => i + 1) }), status: 400, field: 'ids' },
  { kind: 'a single value where a list belongs', as: 'operator', method: 'POST', path: () => '/api/alarms/acknowledge', json: () => ({ ids: 7 }), status: 400, field: 'ids' },
  { kind: 'request id too short to be unique', as: 'operator', method: 'POST', path: () => '/api/alarms/acknowledge', json: () => ({ ids: [7], requestId: 'abc' }), status: 400, field: 'requestId' },
  { kind: 'shelving past 12 hours', as: 'operator', method: 'POST', path: () => '/api/alarms/1/shelve', json: () => ({ reason: 'Probe shelve', minutes: 721 }), status: 400, field: 'minutes' },
  { kind: 'fractional minutes', as: 'operator', method: 'POST', path: () => '/api/alarms/1/shelve', json: () => ({ reason: 'Probe shelve', minutes: 1.5 }), status: 400, field: 'minutes' },
  { kind: 'shelving reason too short to say why', as: 'operator', method: 'POST', path: () => '/api/alarms/1/shelve', json: () => ({ reason: 'no', minutes: 10 }), status: 400, field: 'reason' },
  { kind: 'view outside its choices', as: 'operator', method: 'GET', path: () => '/api/alarms?view=everything', status: 400, field: 'view' },
  { kind: 'limit of 0', as: 'operator', method: 'GET', path: () => '/api/alarms?limit=0', status: 400, field: 'limit' },
  { kind: 'limit that is not a number', as: 'operator', method: 'GET', path: () => '/api/alarms?limit=ten', status: 400, field: 'limit' },
  { kind: 'range that ends before it starts', as: 'operator', method: 'GET', path: () => `/api/alarms?view=history&from=${iso(0)}&to=${iso(-HOUR)}`, status: 400, field: 'to' },
  { kind: 'calendar date that does not exist (30 February)', as: 'operator', method: 'GET', path: () => '/api/alarms?view=history&from=2026-02-30T00:00:00Z', status: 400, field: 'from' },
  { kind: 'calendar date that does not exist (31 April)', as: 'operator', method: 'GET', path: () => '/api/alarms?view=history&to=2026-04-31', status: 400, field: 'to' },
  { kind: 'text that is no time at all', as: 'operator', method: 'GET', path: () => '/api/alarms?view=history&from=yesterday', status: 400, field: 'from' },
  { kind: 'state outside the ISA-18.2 states', as: 'operator', method: 'GET', path: () => '/api/alarms?state=panic', status: 400, field: 'state' },

  // Shift log.
  { kind: 'empty note', as: 'operator', method: 'POST', path: () => '/api/shift-log', json: () => ({ body: '' }), status: 400, field: 'body' },
  { kind: 'note past 4000 characters', as: 'operator', method: 'POST', path: () => '/api/shift-log', json: () => ({ body: long(4001) }), status: 400, field: 'body' },
  { kind: 'time without its zone offset', as: 'operator', method: 'POST', path: () => '/api/shift-log', json: () => ({ body: 'Probe note', at: iso(-HOUR).replace('Z', '') }), status: 400, field: 'at' },
  { kind: 'time in the future', as: 'operator', method: 'POST', path: () => '/api/shift-log', json: () => ({ body: 'Probe note', at: iso(24 * HOUR) }), status: 400, field: 'at' },
  { kind: 'time backdated past the shift', as: 'operator', method: 'POST', path: () => '/api/shift-log', json: () => ({ body: 'Probe note', at: iso(-48 * HOUR) }), status: 400, field: 'at' },
  { kind: 'limit past its maximum', as: 'operator', method: 'GET', path: () => '/api/shift-log?limit=501', status: 400, field: 'limit' },

  // Accounts.
  { kind: 'e-mail address without a domain', as: 'admin', method: 'POST', path: () => '/api/admin/users', json: () => ({ ...user, email: 'probe.user@' }), status: 400, field: 'email' },
  { kind: 'role outside the list', as: 'admin', method: 'POST', path: () => '/api/admin/users', json: () => ({ ...user, role: 'root' }), status: 400, field: 'role' },
  { kind: 'name with a control character (tab)', as: 'admin', method: 'POST', path: () => '/api/admin/users', json: () => ({ ...user, name: 'Probe\tUser' }), status: 400, field: 'name' },
  { kind: 'account switch sent as text', as: 'admin', method: 'PATCH', path: f => `/api/admin/users/${f.userId}`, json: () => ({ active: 'no' }), status: 400, field: 'active' },
  { kind: 'new password shorter than 15 characters', as: 'operator', method: 'POST', path: () => '/api/session/password', json: () => ({ currentPassword: 'whatever it is', newPassword: 'short pass' }), status: 400, field: 'newPassword' },
  { kind: 'password link token of the wrong form', as: 'anonymous', method: 'POST', path: () => '/api/public/set-password', json: () => ({ token: 'not-a-token', password: 'a long enough pass phrase' }), status: 400, field: 'token' },
  { kind: 'sign-in with no e-mail', as: 'anonymous', method: 'POST', path: () => '/api/public/sign-in', json: () => ({ password: 'anything at all' }), status: 400, field: 'email' },

  // Gateways and notification routes.
  { kind: 'key grace period past a week', as: 'admin', method: 'POST', path: f => `/api/admin/gateways/${f.gatewayId}/rotate`, json: () => ({ graceMinutes: 7 * 24 * 60 + 1 }), status: 400, field: 'graceMinutes' },
  { kind: 'negative grace period', as: 'admin', method: 'POST', path: f => `/api/admin/gateways/${f.gatewayId}/rotate`, json: () => ({ graceMinutes: -1 }), status: 400, field: 'graceMinutes' },
  { kind: 'route to both an address and a role', as: 'admin', method: 'POST', path: () => '/api/admin/routes', json: f => ({ ...route(f), role: 'operator' }), status: 400, field: 'email' },
  { kind: 'working hours that start and end at the same minute', as: 'admin', method: 'POST', path: () => '/api/admin/routes', json: f => ({ ...route(f), hours: 'working', workStartMinute: 480, workEndMinute: 480 }), status: 400, field: 'workEndMinute' },
  { kind: 'minute past 23:59', as: 'admin', method: 'POST', path: () => '/api/admin/routes', json: f => ({ ...route(f), workStartMinute: 1440 }), status: 400, field: 'workStartMinute' },
  { kind: 'weekday 8', as: 'admin', method: 'POST', path: () => '/api/admin/routes', json: f => ({ ...route(f), workDays: [1, 8] }), status: 400, field: 'workDays.1' },
  { kind: 'route for no kind of alarm', as: 'admin', method: 'POST', path: () => '/api/admin/routes', json: f => ({ ...route(f), alarmClasses: [] }), status: 400, field: 'alarmClasses' },
  { kind: 'change to a route that changes nothing', as: 'admin', method: 'PATCH', path: f => `/api/admin/routes/${f.routeId}`, json: () => ({}), status: 400, field: 'body' },

  // Review and audit.
  { kind: 'health period longer than a quarter', as: 'supervisor', method: 'GET', path: () => `/api/review/health?from=${iso(-100 * 24 * HOUR)}&to=${iso(0)}`, status: 400, field: 'from' },
  { kind: 'incident window below a minute', as: 'supervisor', method: 'PUT', path: () => '/api/review/settings', json: f => ({ siteId: f.siteId, incidentWindowS: 30 }), status: 400, field: 'incidentWindowS' },
  { kind: 'incident state outside its list', as: 'supervisor', method: 'GET', path: () => '/api/incidents?state=forgotten', status: 400, field: 'state' },
  { kind: 'more tags on a timeline than it charts', as: 'supervisor', method: 'GET', path: () => '/api/incidents/1/timeline?tags=1,2,3,4,5', status: 400, field: 'tags' },
  { kind: 'audit time without its zone offset', as: 'admin', method: 'GET', path: () => '/api/admin/audit?from=2026-01-01T00:00:00', status: 400, field: 'from' },
  { kind: 'audit date that does not exist (29 February of a common year)', as: 'admin', method: 'GET', path: () => '/api/admin/audit?from=2026-02-29T00:00:00Z', status: 400, field: 'from' },
  { kind: 'audit time in 1970', as: 'admin', method: 'GET', path: () => '/api/admin/audit?from=1970-01-01T00:00:00Z', status: 400, field: 'from' },
  { kind: 'audit action with SQL in it', as: 'admin', method: 'GET', path: () => `/api/admin/audit?action=${encodeURIComponent('x\'; drop table audit_log; --')}`, status: 400, field: 'action' },

  // CSV upload query.
  { kind: 'CSV layout outside its choices', as: 'engineer', method: 'POST', path: f => `/api/uploads/import?siteId=${f.siteId}&format=diagonal&timeColumn=t`, raw: { type: 'text/csv', body: 't,TI-101\n' }, status: 400, field: 'format' },
  { kind: 'long CSV layout without its tag column', as: 'engineer', method: 'POST', path: f => `/api/uploads/import?siteId=${f.siteId}&format=long&timeColumn=t&valueColumn=v`, raw: { type: 'text/csv', body: 't,v\n' }, status: 400, field: 'tagColumn' },
  { kind: 'CSV delimiter outside its choices', as: 'engineer', method: 'POST', path: f => `/api/uploads/preview?siteId=${f.siteId}&delimiter=x`, raw: { type: 'text/csv', body: 't,TI-101\n' }, status: 400, field: 'delimiter' },

  // Ingest envelope (the per-sample checks answer in `rejected`, see tests/e2e/ingest.test.ts).
  { kind: 'ingest batch without its samples', as: 'gateway', method: 'POST', path: () => '/api/ingest', json: () => ({ readings: [] }), status: 400, field: 'samples', countedIn: GATEWAY_COUNTERS },
  { kind: 'ingest batch of no samples', as: 'gateway', method: 'POST', path: () => '/api/ingest', json: () => ({ samples: [] }), status: 400, field: 'samples', countedIn: GATEWAY_COUNTERS },

  // The body itself.
  { kind: 'JSON cut off half-way', as: 'operator', method: 'POST', path: () => '/api/shift-log', raw: { type: 'application/json', body: '{"body": "Probe' }, status: 400, field: 'body' },
  { kind: 'form post instead of JSON', as: 'operator', method: 'POST', path: () => '/api/shift-log', raw: { type: 'application/x-www-form-urlencoded', body: 'body=Probe' }, status: 415, field: 'content-type' },
  { kind: 'JSON array where an object belongs', as: 'operator', method: 'POST', path: () => '/api/shift-log', raw: { type: 'application/json', body: '["Probe note"]' }, status: 400, field: 'body' },
]
