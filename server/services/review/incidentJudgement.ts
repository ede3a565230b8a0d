import type { Db } from '../../utils/db'

/** Evaluations returned per tag at most; a verdict change is always among them. */
const MAX_POINTS = 1_000
const MAX_POINTS_WITH_CHANGES = 2_000

export interface JudgementStrip {
  tagId: number
  /** Epoch seconds of the evaluations kept, oldest first. */
  time: number[]
  /** 'slowing down' | 'noise level changed' | 'no trend', or null where the window failed the quality gate. */
  evidence: (string | null)[]
  /** p of the stability trend test (AR(1) rising), null where it was not run. */
  p: (number | null)[]
  /** More evaluations stood in the span than were returned (evenly thinned). */
  thinned: boolean
}

/**
 * The early-warning judgement the live pipeline stored for one tag over [from, to] (epoch ms):
 * thinned evenly to about a thousand evaluations for the p line, but every evaluation where the
 * verdict changes, or the one before it, is kept so the "slowing down" runs start and end where
 * they did.
 */
export async function judgementStrip(db: Db, tagId: number, from: number, to: number): Promise<JudgementStrip> {
  const rows = await db.$sql<{ t: number, evidence: string | null, p: number | null, total: string }[]>`
    with pts as (
      select extract(epoch from time)::float8 as t, evidence, p_ar1 as p, row_number() over w as n, count(*) over () as total,
        evidence is distinct from lag(evidence) over w or evidence is distinct from lead(evidence) over w as edge
      from indicator_points
      where tag_id = ${tagId} and time >= ${new Date(from).toISOString()}::timestamptz and time <= ${new Date(to).toISOString()}::timestamptz
      window w as (order by time))
    select t, evidence, p, total from pts
    where edge or (n - 1) % greatest(1, ceil(total / ${MAX_POINTS}::float8))::int = 0
    order by t limit ${MAX_POINTS_WITH_CHANGES}`
  const total = Number(rows[0]?.total ?? 0)
  return {
    tagId,
    time: rows.map(r => Number(r.t)),
    evidence: rows.map(r => r.evidence),
    p: rows.map(r => (r.p === null ? null : Number(r.p))),
    thinned: rows.length < total,
  }
}
