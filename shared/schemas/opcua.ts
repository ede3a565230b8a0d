import { z } from 'zod'
import { dbId, displayNameField, JSON_MAX_BYTES_PER_CHAR, textField } from './fields'
import { tagCreateSchema } from './plant'

// What an admin may set on an OPC UA connection (issue 17 item 1). The collector reads these
// (server/services/opcua/collector.ts); the status columns are its own and never set here.

/** OPC UA message security modes (IEC 62541-4 §7.15), as the database check allows them. */
export const OPCUA_SECURITY_MODES = ['None', 'Sign', 'SignAndEncrypt'] as const
/** Security policies the client library (node-opcua 2.160) offers by name; the obsolete ones are left out. */
export const OPCUA_SECURITY_POLICIES = ['None', 'Basic256Sha256', 'Aes128_Sha256_RsaOaep', 'Aes256_Sha256_RsaPss'] as const

// One hour at most: [common practice] plant variables are sampled in the 100 ms – 10 s range; an
// hour guards against a minutes-for-milliseconds slip without refusing any sensible setting.
const MAX_INTERVAL_MS = 3_600_000
const intervalMs = (min: number) => z.number({ required_error: 'is required', invalid_type_error: 'must be a number of milliseconds' })
  .int('must be whole milliseconds').min(min, `must be at least ${min} ms`).max(MAX_INTERVAL_MS, `must be at most ${MAX_INTERVAL_MS} ms (1 hour)`)

const endpointUrl = textField().trim().max(500, 'must have at most 500 characters')
  .regex(/^opc\.tcp:\/\/[^\s/:]+(?::\d{1,5})?(?:\/\S*)?$/i, 'must be an OPC UA endpoint such as opc.tcp://plant-host:4840')

const connectionFields = {
  name: displayNameField(),
  endpointUrl,
  securityMode: z.enum(OPCUA_SECURITY_MODES, { errorMap: () => ({ message: `must be one of ${OPCUA_SECURITY_MODES.join(', ')}` }) }),
  securityPolicy: z.enum(OPCUA_SECURITY_POLICIES, { errorMap: () => ({ message: `must be one of ${OPCUA_SECURITY_POLICIES.join(', ')}` }) }),
  // Empty means anonymous sign-in to the plant server.
  username: textField().trim().max(200, 'must have at most 200 characters').nullable().transform(s => s || null),
  samplingIntervalMs: intervalMs(0),
  publishingIntervalMs: intervalMs(1),
  enabled: z.boolean({ invalid_type_error: 'must be true or false' }),
}

// Sign and SignAndEncrypt need a policy that signs; None needs None (IEC 62541-4 §7.36).
const policyFitsMode = (v: { securityMode?: string, securityPolicy?: string }) =>
  v.securityMode === undefined || v.securityPolicy === undefined || (v.securityMode === 'None') === (v.securityPolicy === 'None')
const POLICY_MESSAGE = { message: 'must be None exactly when securityMode is None', path: ['securityPolicy'] }

/** A password to store (encrypted) or null to remove it; left out, the stored one stays. Never sent back. */
const password = textField().max(200, 'must have at most 200 characters').nullable().transform(s => s || null)

export const opcuaConnectionCreateSchema = z.object({
  siteId: dbId('site'),
  ...connectionFields,
  username: connectionFields.username.default(null),
  securityMode: connectionFields.securityMode.default('None'),
  securityPolicy: connectionFields.securityPolicy.default('None'),
  samplingIntervalMs: connectionFields.samplingIntervalMs.default(1000),
  publishingIntervalMs: connectionFields.publishingIntervalMs.default(1000),
  enabled: connectionFields.enabled.default(true),
  password: password.optional(),
}).strict().refine(policyFitsMode, POLICY_MESSAGE)

export const opcuaConnectionUpdateSchema = z.object({ ...connectionFields, password: password.optional() })
  .partial().strict().refine(policyFitsMode, POLICY_MESSAGE)

const MAX_MAPPINGS = 2000
const NODE_ID_MAX_CHARS = 500
const nodeIdField = textField().trim().min(1, 'is required').max(NODE_ID_MAX_CHARS, `must have at most ${NODE_ID_MAX_CHARS} characters`)
  // The text forms of IEC 62541-6 §5.3.1.10: ns=<n>;i=|s=|g=|b=<id>, or a bare i=/s=… in namespace 0.
  .regex(/^(?:ns=\d+;|nsu=[^;]+;)?[isgb]=.+$/, 'must be an OPC UA node id such as ns=2;s=Boiler.TI-401')
/** Body of a node-to-tag table at its largest: every node id full and escaped, plus its keys and a tag id (under 64 bytes). */
export const OPCUA_MAPPINGS_MAX_BYTES = MAX_MAPPINGS * (NODE_ID_MAX_CHARS * JSON_MAX_BYTES_PER_CHAR + 64) + 1024

/** The whole node-to-tag table of one connection, replaced at once. */
export const opcuaMappingsSchema = z.object({
  mappings: z.array(z.object({
    nodeId: nodeIdField,
    tagId: dbId('tag'),
  }).strict(), { invalid_type_error: 'must be a list' }).max(MAX_MAPPINGS, `must have at most ${MAX_MAPPINGS} entries`)
    .superRefine((list, ctx) => {
      // One variable feeds one tag and a tag has one source (the table's unique keys): say which row repeats.
      for (const key of ['nodeId', 'tagId'] as const) {
        const seen = new Set<unknown>()
        list.forEach((m, i) => {
          if (seen.has(m[key])) ctx.addIssue({ code: 'custom', path: [i, key], message: 'appears twice in the list' })
          seen.add(m[key])
        })
      }
    }),
}).strict()

export type OpcuaConnectionCreate = z.output<typeof opcuaConnectionCreateSchema>
export type OpcuaConnectionUpdate = z.output<typeof opcuaConnectionUpdateSchema>

/** One step of a browse: the node whose children to list (the Objects folder when left out). */
export const opcuaBrowseQuerySchema = z.object({ nodeId: nodeIdField.optional() }).strict()

/**
 * A tag made from a browsed variable and read from it: the tag under the workbench's own contract
 * (ISA-5.1 code, range, unit), the node it reads, and the variable's display name as the server gave it.
 */
export const opcuaTagFromVariableSchema = z.object({
  nodeId: nodeIdField,
  displayName: textField().trim().max(200, 'must have at most 200 characters').default(''),
  tag: tagCreateSchema,
}).strict()
