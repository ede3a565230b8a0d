import { SHIFT_HOURS, type ShiftLogCreate, type ShiftLogNote, type ShiftLogQuery } from '#shared/schemas/shiftLog'
import type { Db } from '../../utils/db'

/** A link that does not resolve, or resolves to another place than the rest of the note. */
export class ShiftLogLinkError extends Error {
  constructor(readonly field: string, message: string) { super(message) }
}

/**
 * Works out the note's site and unit from what it links to, and checks the links agree: a tag must
 * sit on the linked unit, an alarm on the linked unit or tag. A note linked to nothing belongs to
 * the given site, or to the only site when there is just one.
 */
async function resolveLinks(db: Db, input: ShiftLogCreate) {
  const sql = db.$sql
  let siteId = input.siteId
  let unitId = input.unitId
  const agree = (field: string, what: string, site: number, unit: number | null) => {
    if (siteId !== undefined && siteId !== site) throw new ShiftLogLinkError(field, `${field}: ${what} belongs to another site`)
    if (unit !== null && unitId !== undefined && unitId !== unit) throw new ShiftLogLinkError(field, `${field}: ${what} is not on unit ${unitId}`)
    siteId = site
    if (unit !== null) unitId = unit
  }
  if (input.unitId !== undefined) {
    const [u] = await sql<{ siteId: number }[]>`select site_id as "siteId" from units where id = ${input.unitId}`
    if (!u) throw new ShiftLogLinkError('unitId', `unitId: unit ${input.unitId} does not exist`)
    agree('unitId', `unit ${input.unitId}`, u.siteId, null)
  }
  if (input.tagId !== undefined) {
    const [t] = await sql<{ siteId: number, unitId: number }[]>`select site_id as "siteId", unit_id as "unitId" from tags where id = ${input.tagId}`
    if (!t) throw new ShiftLogLinkError('tagId', `tagId: tag ${input.tagId} does not exist`)
    agree('tagId', `tag ${input.tagId}`, t.siteId, t.unitId)
  }
  if (input.alarmId !== undefined) {
    const [a] = await sql<{ siteId: number, unitId: number, tagId: number | null }[]>`
      select site_id as "siteId", unit_id as "unitId", tag_id as "tagId" from alarms where id = ${input.alarmId}`
    if (!a) throw new ShiftLogLinkError('alarmId', `alarmId: alarm ${input.alarmId} does not exist`)
    if (input.tagId !== undefined && a.tagId !== input.tagId) throw new ShiftLogLinkError('alarmId', `alarmId: alarm ${input.alarmId} is not on tag ${input.tagId}`)
    agree('alarmId', `alarm ${input.alarmId}`, a.siteId, a.unitId)
  }
  if (siteId === undefined) {
    const sites = await sql<{ id: number }[]>`select id from sites order by id limit 2`
    if (sites.length !== 1) throw new ShiftLogLinkError('siteId', 'siteId: is required when the note links to no unit, tag or alarm')
    siteId = sites[0]!.id
  }
  else {
    const [s] = await sql`select 1 from sites where id = ${siteId}`
    if (!s) throw new ShiftLogLinkError('siteId', `siteId: site ${siteId} does not exist`)
  }
  return { siteId, unitId: unitId ?? null }
}

const NOTE_COLUMNS = (sql: Db['$sql']) => sql`
  n.id, n.at, n.created_at as "createdAt", n.body, n.site_id as "siteId", n.author_id as "authorId", us.name as "authorName",
  n.unit_id as "unitId", u.code as "unitCode", n.tag_id as "tagId", t.code as "tagCode",
  n.alarm_id as "alarmId", r.name as "alarmRuleName"`
// `source` is the table, or the CTE of a note just inserted, so both read back the same shape.
const NOTE_FROM = (sql: Db['$sql'], source = sql`shift_log_notes`) => sql`
  from ${source} n
  left join users us on us.id = n.author_id
  left join units u on u.id = n.unit_id
  left join tags t on t.id = n.tag_id
  left join alarms a on a.id = n.alarm_id
  left join alarm_rules r on r.id = a.rule_id`

function toNote(row: Record<string, unknown>): ShiftLogNote {
  return {
    ...(row as unknown as ShiftLogNote),
    id: Number(row.id),
    alarmId: row.alarmId === null ? null : Number(row.alarmId),
    at: new Date(row.at as string).toISOString(),
    createdAt: new Date(row.createdAt as string).toISOString(),
  }
}

export async function addShiftLogNote(db: Db, authorId: number, input: ShiftLogCreate): Promise<ShiftLogNote> {
  const { siteId, unitId } = await resolveLinks(db, input)
  const sql = db.$sql
  // Drizzle's postgres.js client has no Date serializer: times go as ISO text with a cast.
  const [row] = await sql`
    with inserted as (
      insert into shift_log_notes (site_id, author_id, at, body, unit_id, tag_id, alarm_id)
      values (${siteId}, ${authorId}, ${(input.at ?? new Date()).toISOString()}::timestamptz, ${input.body}, ${unitId}, ${input.tagId ?? null}, ${input.alarmId ?? null})
      returning *)
    select ${NOTE_COLUMNS(sql)} ${NOTE_FROM(sql, sql`inserted`)}`
  return toNote(row!)
}

/** Recent notes newest first, or the handover: the last shift's notes in the order they happened. */
export async function listShiftLogNotes(db: Db, query: ShiftLogQuery, nowMs = Date.now()): Promise<ShiftLogNote[]> {
  const sql = db.$sql
  const since = query.view === 'handover' ? new Date(nowMs - SHIFT_HOURS * 3_600_000) : null
  const rows = await sql`
    select ${NOTE_COLUMNS(sql)} ${NOTE_FROM(sql)}
    where true
      ${since ? sql`and n.at >= ${since.toISOString()}::timestamptz` : sql``}
      ${query.unitId ? sql`and n.unit_id = ${query.unitId}` : sql``}
      ${query.tagId ? sql`and n.tag_id = ${query.tagId}` : sql``}
      ${query.alarmId ? sql`and n.alarm_id = ${query.alarmId}` : sql``}
    order by n.at ${query.view === 'handover' ? sql`asc` : sql`desc`}, n.id
    limit ${query.limit}`
  return rows.map(toNote)
}
