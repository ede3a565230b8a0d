import { sql } from 'drizzle-orm'
import type { EvaluationPoint } from '#shared/pipeline/evaluateRecord'
import { alarmContext } from '#shared/pipeline/ruleMeasure'
import { tagObservations } from '#shared/pipeline/ruleReplay'
import { evaluateRecords } from './recordEvaluation'
import { claimTags, latestStoredPoints, loadRecords, type TagRecord } from './tagBatchLoad'
import { advanceClaims, storePoints, storeStatuses } from './tagBatchStore'
import { loadRuleRuntimes, observe, saveRuleRuntimes, type RuleRuntime } from './ruleEvaluation'
import type { Db, DbTransaction } from '../../utils/db'
import type { ChangeContext } from '../../utils/changeContext'
import type { StageClock } from './stageClock'

export interface BatchOutcome {
  /** Tags this worker locked; the others were held by another worker. */
  claimed: number
  samples: number
  evaluations: number
}

interface EvaluatedTag extends TagRecord {
  points: EvaluationPoint[]
  samplesSinceEvaluation: number
  /** The newest evaluation stored before this batch. */
  previous: EvaluationPoint | null
}

/**
 * A batch of tags' share of a tick, in one transaction: claim the tags (SKIP LOCKED: another
 * instance may hold some), load their new samples and the history the windows need, evaluate,
 * store the indicator points, run their rules, refresh their status and move their claims
 * forward. Every step is one statement for the whole batch, so round trips do not grow with it.
 * A crash anywhere leaves the tags exactly as before, and the next tick redoes them. Samples
 * stamped after `horizon` (now plus the skew allowance) wait: they never move a claim ahead.
 */
export async function processTagBatch(
  db: Db, tagIds: number[], ctx: ChangeContext, clock: StageClock, horizon: Date, now = Date.now() / 1000,
): Promise<BatchOutcome> {
  return db.transaction(async (tx) => {
    // A batch statement's estimated cost (rows per tag × tags) crosses jit_above_cost, and
    // compiling it takes far longer than running these index probes.
    await tx.execute(sql`set local jit = off`)
    const claims = await claimTags(tx, tagIds)
    const records = claims.length === 0 ? [] : await clock.run('load samples', () => loadRecords(tx, claims, horizon))
    const active = records.filter(r => r.newCount > 0)
    const outcome = { claimed: claims.length, samples: 0, evaluations: 0 }
    if (active.length === 0) return outcome
    const previous = await clock.run('load samples', () => latestStoredPoints(tx, active.map(r => r.tag.id)))
    // On worker threads (recordEvaluation.ts), which cannot share the clock: 'evaluate' is the
    // awaited whole, queueing for a thread included, not the engine's own stages.
    const results = await clock.run('evaluate', () => evaluateRecords(active.map(r => ({
      tagId: r.tag.id, times: r.t, values: r.v, firstNew: r.t.length - r.newCount,
      samplesSinceEvaluation: r.claim.samplesSinceEvaluation, samplePeriodS: r.tag.samplePeriodS, settings: r.settings,
    }))))
    const evaluated: EvaluatedTag[] = active.map((r, i) => ({ ...r, ...results[i]!, previous: previous.get(r.tag.id) ?? null }))
    await clock.run('store points', () => storePoints(tx, evaluated.map(e => ({ tagId: e.tag.id, settingsVersionId: e.settings.versionId, points: e.points }))))
    await clock.run('rules and alarms', () => runRules(tx, evaluated, ctx))
    await clock.run('status', () => storeStatuses(tx, evaluated.map(e => ({
      tag: e.tag, latest: e.points.at(-1) ?? e.previous, latestValue: e.v[e.v.length - 1]!, latestTime: e.t[e.t.length - 1]!,
    })), now))
    await advanceClaims(tx, evaluated.map(e => ({
      tagId: e.tag.id,
      lastSampleTime: e.t[e.t.length - 1]!,
      lastEvaluatedTime: e.points.length > 0 ? new Date(Math.round(e.points.at(-1)!.time * 1000)) : e.claim.lastEvaluatedTime,
      samplesSinceEvaluation: e.samplesSinceEvaluation,
    })))
    for (const e of evaluated) {
      outcome.samples += e.newCount
      outcome.evaluations += e.points.length
    }
    return outcome
  })
}

/**
 * Feeds each tag's new samples and evaluations to its rules in time order (shared/pipeline/ruleReplay). The rules'
 * states are locked once for the batch and saved once at its end.
 */
async function runRules(tx: DbTransaction, evaluated: EvaluatedTag[], ctx: ChangeContext): Promise<void> {
  const runtimes = await loadRuleRuntimes(tx, { tagIds: evaluated.map(e => e.tag.id) })
  if (runtimes.length === 0) return
  for (const e of evaluated) {
    const mine = runtimes.filter(rt => rt.rule.tagId === e.tag.id)
    if (mine.length > 0) await replayTag(tx, e, mine, ctx)
  }
  await saveRuleRuntimes(tx, runtimes)
}

async function replayTag(tx: DbTransaction, e: EvaluatedTag, runtimes: RuleRuntime[], ctx: ChangeContext): Promise<void> {
  const observations = tagObservations(e.t, e.v, e.q, e.t.length - e.newCount, e.points, runtimes.map(rt => rt.rule.measure), e.previous)
  for (const o of observations) await observe(tx, runtimes[o.rule]!, o.time, o.value, () => alarmContext(o.current), ctx)
}
