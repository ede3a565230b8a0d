// Every server route × every kind of caller, with the answer the caller must get (issue 16 item 5).
// Written from the spec, not read from the code: the roles × capabilities table of
// docs/design.md §D2.1 and the route guards of §D6. Routes those sections do not list are filed
// under the capability of the screen that uses them (§D5: the workbench, the bump tests and the
// indicator settings are the engineer's; the admin screens are the admin's).
// tests/e2e/roleMatrix.test.ts finds the route files under server/api and fails on a route
// without a row here, and on a row without a route.

export const CALLERS = ['anonymous', 'operator', 'engineer', 'supervisor', 'admin', 'gateway'] as const
export type Caller = typeof CALLERS[number]

/** 'allowed': past the guard (any answer but 401/403); 401: not signed in or no valid key; 403: wrong role. */
export type Outcome = 'allowed' | 401 | 403
type Row = Record<Caller, Outcome>

const ok = 'allowed'
function row(...outcomes: Outcome[]): Row {
  return Object.fromEntries(CALLERS.map((caller, i) => [caller, outcomes[i]!])) as Row
}

// One line per kind of guard, columns in CALLERS order. A gateway key is no session: it opens
// the ingest route and nothing else (§D2.2).
//                   anonymous operator engineer supervisor admin gateway
const PUBLIC = row(ok, ok, ok, ok, ok, ok)
const SESSION = row(401, ok, ok, ok, ok, 401)
const VIEW = row(401, ok, ok, ok, ok, 401)
const RESPOND = row(401, ok, ok, ok, 403, 401)
const CONFIGURE = row(401, 403, ok, 403, 403, 401)
const REVIEW = row(401, 403, 403, ok, 403, 401)
const ADMIN = row(401, 403, 403, 403, ok, 401)
const GATEWAY = row(401, 401, 401, 401, 401, ok)

/**
 * Rows the test makes for the path's `:id`, so an allowed call reaches a real row and a 404 can
 * never stand in for a role check. Routes that end or spend a row (revoke, delete, retire, end
 * sessions) get a spare of their own, made for this test.
 */
export type Fixture =
  | 'alarm' | 'alert' | 'bumpTest' | 'incident' | 'rule' | 'site' | 'unit' | 'tag'
  | 'spareSite' | 'spareUnit' | 'spareTag' | 'spareUser'
  | 'gatewayToRevoke' | 'gatewayToRotate' | 'opcuaConnection' | 'opcuaToDelete' | 'route' | 'routeToDelete' | 'replay'

export interface MatrixEntry {
  expect: Row
  /** The row whose id goes into `:id`. */
  id?: Fixture
  /** The body a state-changing call sends: JSON `{}` unless the route takes a CSV file. */
  body?: 'csv'
  /** The call ends the session it carries, so each caller uses a fresh one. */
  endsSession?: true
}

/**
 * Routes the server has without a file under server/api: nuxt-auth-utils 0.5.30 registers these
 * (its dist/module.mjs, addServerHandler). They answer anyone by design: GET tells the page who is
 * signed in (server/plugins/2.sessionFollowsAccount.ts ends a session the account no longer
 * allows), DELETE drops the browser's cookie; signing out for good is POST /api/session/sign-out.
 */
export const MODULE_ROUTES = ['GET /api/_auth/session', 'DELETE /api/_auth/session']

export const ROLE_MATRIX: Record<string, MatrixEntry> = {
  'GET /api/_auth/session': { expect: PUBLIC },
  'DELETE /api/_auth/session': { expect: PUBLIC },

  'GET /api/admin/audit/export': { expect: ADMIN },
  'GET /api/admin/audit': { expect: ADMIN },
  'POST /api/admin/gateways/:id/revoke': { expect: ADMIN, id: 'gatewayToRevoke' },
  'POST /api/admin/gateways/:id/rotate': { expect: ADMIN, id: 'gatewayToRotate' },
  'GET /api/admin/gateways': { expect: ADMIN },
  'POST /api/admin/gateways': { expect: ADMIN },
  'DELETE /api/admin/opcua/:id': { expect: ADMIN, id: 'opcuaToDelete' },
  'PATCH /api/admin/opcua/:id': { expect: ADMIN, id: 'opcuaConnection' },
  'PUT /api/admin/opcua/:id/mappings': { expect: ADMIN, id: 'opcuaConnection' },
  'GET /api/admin/opcua/:id/browse': { expect: ADMIN, id: 'opcuaConnection' },
  'POST /api/admin/opcua/:id/tags': { expect: ADMIN, id: 'opcuaConnection' },
  'GET /api/admin/opcua': { expect: ADMIN },
  'POST /api/admin/opcua': { expect: ADMIN },
  'DELETE /api/admin/routes/:id': { expect: ADMIN, id: 'routeToDelete' },
  'PATCH /api/admin/routes/:id': { expect: ADMIN, id: 'route' },
  'GET /api/admin/routes/:id/deliveries': { expect: ADMIN, id: 'route' },
  'POST /api/admin/routes/:id/test': { expect: ADMIN, id: 'route' },
  'GET /api/admin/routes': { expect: ADMIN },
  'POST /api/admin/routes': { expect: ADMIN },
  'GET /api/admin/storage': { expect: ADMIN },
  'PATCH /api/admin/storage/sites/:id': { expect: ADMIN, id: 'site' },
  'PATCH /api/admin/users/:id': { expect: ADMIN, id: 'spareUser' },
  'POST /api/admin/users/:id/end-sessions': { expect: ADMIN, id: 'spareUser' },
  'POST /api/admin/users/:id/password-reset': { expect: ADMIN, id: 'spareUser' },
  'GET /api/admin/users': { expect: ADMIN },
  'POST /api/admin/users': { expect: ADMIN },

  'GET /api/alarms/:id': { expect: VIEW, id: 'alarm' },
  'POST /api/alarms/:id/shelve': { expect: RESPOND, id: 'alarm' },
  'POST /api/alarms/:id/unshelve': { expect: RESPOND, id: 'alarm' },
  'POST /api/alarms/acknowledge': { expect: RESPOND },
  'GET /api/alarms': { expect: VIEW },

  'POST /api/bump-tests/:id/fit': { expect: CONFIGURE, id: 'bumpTest' },

  'GET /api/incidents/:id': { expect: VIEW, id: 'incident' },
  'PATCH /api/incidents/:id': { expect: REVIEW, id: 'incident' },
  'GET /api/incidents/:id/events.csv': { expect: VIEW, id: 'incident' },
  'POST /api/incidents/:id/merge': { expect: REVIEW, id: 'incident' },
  'POST /api/incidents/:id/split': { expect: REVIEW, id: 'incident' },
  'POST /api/incidents/:id/state': { expect: REVIEW, id: 'incident' },
  'GET /api/incidents/:id/timeline': { expect: VIEW, id: 'incident' },
  'GET /api/incidents': { expect: VIEW },
  'POST /api/incidents': { expect: REVIEW },

  'POST /api/ingest': { expect: GATEWAY },
  'GET /api/overview': { expect: VIEW },
  'GET /api/plant-model': { expect: CONFIGURE },

  'GET /api/public/health': { expect: PUBLIC },
  'GET /api/public/password-link': { expect: PUBLIC },
  'POST /api/public/set-password': { expect: PUBLIC },
  'POST /api/public/sign-in': { expect: PUBLIC },
  'POST /api/public/test/run-task': { expect: PUBLIC },

  'GET /api/replays/:id': { expect: CONFIGURE, id: 'replay' },
  'GET /api/replays': { expect: CONFIGURE },
  'POST /api/replays': { expect: CONFIGURE },
  'POST /api/replays/upload': { expect: CONFIGURE, body: 'csv' },

  'PUT /api/review/alert-outcomes/:id': { expect: REVIEW, id: 'alert' },
  'GET /api/review/health': { expect: VIEW },
  'GET /api/review/settings': { expect: VIEW },
  'PUT /api/review/settings': { expect: REVIEW },

  'GET /api/rules/:id': { expect: VIEW, id: 'rule' },
  'PATCH /api/rules/:id': { expect: CONFIGURE, id: 'rule' },
  'GET /api/rules': { expect: VIEW },
  'POST /api/rules': { expect: CONFIGURE },
  'POST /api/rules/preview': { expect: CONFIGURE },

  'POST /api/session/password': { expect: SESSION },
  'POST /api/session/sign-out': { expect: SESSION, endsSession: true },

  'GET /api/shift-log/handover': { expect: VIEW },
  'GET /api/shift-log': { expect: VIEW },
  'POST /api/shift-log': { expect: RESPOND },

  'PATCH /api/sites/:id': { expect: CONFIGURE, id: 'site' },
  'POST /api/sites/:id/restore': { expect: CONFIGURE, id: 'spareSite' },
  'POST /api/sites/:id/retire': { expect: CONFIGURE, id: 'spareSite' },
  'GET /api/sites': { expect: VIEW },
  'POST /api/sites': { expect: CONFIGURE },

  'PATCH /api/tags/:id': { expect: CONFIGURE, id: 'tag' },
  'GET /api/tags/:id/bump-tests': { expect: CONFIGURE, id: 'tag' },
  'POST /api/tags/:id/bump-tests': { expect: CONFIGURE, id: 'tag' },
  'GET /api/tags/:id/indicator-settings': { expect: CONFIGURE, id: 'tag' },
  'PUT /api/tags/:id/indicator-settings': { expect: CONFIGURE, id: 'tag' },
  'POST /api/tags/:id/indicator-settings/preview': { expect: CONFIGURE, id: 'tag' },
  'POST /api/tags/:id/restore': { expect: CONFIGURE, id: 'spareTag' },
  'POST /api/tags/:id/retire': { expect: CONFIGURE, id: 'spareTag' },
  'GET /api/tags/:id/series': { expect: VIEW, id: 'tag' },
  'GET /api/tags': { expect: VIEW },
  'POST /api/tags': { expect: CONFIGURE },

  'PATCH /api/units/:id': { expect: CONFIGURE, id: 'unit' },
  'POST /api/units/:id/restore': { expect: CONFIGURE, id: 'spareUnit' },
  'POST /api/units/:id/retire': { expect: CONFIGURE, id: 'spareUnit' },
  'GET /api/units/:id/slow-mode': { expect: VIEW, id: 'unit' },
  'GET /api/units': { expect: VIEW },
  'POST /api/units': { expect: CONFIGURE },

  'POST /api/uploads/import': { expect: CONFIGURE, body: 'csv' },
  'POST /api/uploads/rejections': { expect: CONFIGURE, body: 'csv' },
  'POST /api/uploads/preview': { expect: CONFIGURE, body: 'csv' },
}
