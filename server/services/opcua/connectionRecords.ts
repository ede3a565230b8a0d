import type { TransactionSql } from 'postgres'
import type { Db } from '../../utils/db'
import type { IngestCounts } from '../ingest/ingestBatch'

/** What a collector needs of one connection and its mapped variables. */
export interface CollectorConfig {
  id: number
  siteId: number
  name: string
  endpointUrl: string
  securityMode: 'None' | 'Sign' | 'SignAndEncrypt'
  securityPolicy: string
  username: string | null
  passwordSecret: string | null
  samplingIntervalMs: number
  publishingIntervalMs: number
  configVersion: number
  mappings: { nodeId: string, tagCode: string }[]
}

export async function enabledConnections(db: Db): Promise<CollectorConfig[]> {
  const rows = await db.$sql<{ id: number, site_id: number, name: string, endpoint_url: string, security_mode: string,
    security_policy: string, username: string | null, password_secret: string | null, sampling_interval_ms: number,
    publishing_interval_ms: number, config_version: number, mappings: { nodeId: string, tagCode: string }[] }[]>`
    select c.id, c.site_id, c.name, c.endpoint_url, c.security_mode, c.security_policy, c.username, c.password_secret,
      c.sampling_interval_ms, c.publishing_interval_ms, c.config_version,
      coalesce(json_agg(json_build_object('nodeId', m.node_id, 'tagCode', t.code) order by m.id)
        filter (where m.id is not null and t.retired_at is null), '[]') as mappings
    from opcua_connections c
    left join opcua_mappings m on m.connection_id = c.id
    left join tags t on t.id = m.tag_id
    where c.enabled
    group by c.id order by c.id`
  return rows.map(r => ({
    id: r.id, siteId: r.site_id, name: r.name, endpointUrl: r.endpoint_url, securityMode: r.security_mode as CollectorConfig['securityMode'],
    securityPolicy: r.security_policy, username: r.username, passwordSecret: r.password_secret,
    samplingIntervalMs: r.sampling_interval_ms, publishingIntervalMs: r.publishing_interval_ms, configVersion: r.config_version,
    mappings: r.mappings,
  }))
}

/** How to reach one connection's server (enabled or not), for the admin's browse; undefined when there is no such connection. */
export async function connectionEndpoint(db: Db, id: number) {
  const [row] = await db.$sql<{ endpoint_url: string, security_mode: string, security_policy: string, username: string | null,
    password_secret: string | null }[]>`
    select endpoint_url, security_mode, security_policy, username, password_secret from opcua_connections where id = ${id}`
  if (!row) return undefined
  return {
    endpointUrl: row.endpoint_url, securityMode: row.security_mode as CollectorConfig['securityMode'], securityPolicy: row.security_policy,
    username: row.username, passwordSecret: row.password_secret,
  }
}

/** Newest stored sample time per tag code of a site: where a history backfill starts. */
export async function newestSampleTimes(db: Db, siteId: number, codes: string[]): Promise<Map<string, number>> {
  if (codes.length === 0) return new Map()
  const rows = await db.$sql<{ code: string, newest_ms: number | null }[]>`
    select t.code, (extract(epoch from (select max(s.time) from samples s where s.tag_id = t.id)) * 1000)::float8 as newest_ms
    from tags t where t.site_id = ${siteId} and t.code = any(${db.$sql.array(codes)}::text[])`
  return new Map(rows.filter(r => r.newest_ms !== null).map(r => [r.code, r.newest_ms!]))
}

/** Adds one stored batch to the connection's counters, inside the batch's transaction. */
export async function countConnectionBatch(tx: TransactionSql, connectionId: number, counts: IngestCounts, newestMs: number | null) {
  await tx`
    update opcua_connections set accepted_count = accepted_count + ${counts.accepted},
      duplicate_count = duplicate_count + ${counts.duplicates}, rejected_count = rejected_count + ${counts.rejected},
      last_value_at = greatest(last_value_at, ${newestMs === null ? null : new Date(newestMs).toISOString()}::timestamptz)
    where id = ${connectionId}`
}

export interface CollectorStatus {
  state: 'connecting' | 'connected' | 'retrying' | 'stopped'
  stateSinceMs: number
  valuesPerMinute: number
  reconnects: number
  backfilled: number
  lastError: { message: string, atMs: number } | null
  timeBasis: Map<string, 'source' | 'server'>
}

// Times go as ISO text cast in SQL: postgres.js serialises a Date only where it knows the column's type.
/** Writes what the admin screen shows of a connection; counters written here are deltas since the last write. */
export async function writeConnectionStatus(db: Db, connectionId: number, owner: string | null, status: CollectorStatus,
  deltas: { reconnects: number, backfilled: number }) {
  await db.$sql.begin(async (tx) => {
    await tx`
      update opcua_connections set state = ${status.state}, state_since = ${new Date(status.stateSinceMs).toISOString()}::timestamptz, owner = ${owner},
        values_per_minute = ${status.valuesPerMinute}, reconnect_count = reconnect_count + ${deltas.reconnects},
        backfilled_count = backfilled_count + ${deltas.backfilled},
        last_error = coalesce(${status.lastError?.message ?? null}, last_error),
        last_error_at = coalesce(${status.lastError ? new Date(status.lastError.atMs).toISOString() : null}::timestamptz, last_error_at)
      where id = ${connectionId}`
    for (const [code, basis] of status.timeBasis) {
      await tx`
        update opcua_mappings m set time_basis = ${basis} from tags t
        where t.id = m.tag_id and m.connection_id = ${connectionId} and t.code = ${code} and m.time_basis is distinct from ${basis}`
    }
  })
}
