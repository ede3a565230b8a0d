import { and, desc, eq, isNull } from 'drizzle-orm'
import { DEFAULT_QUALITY_LIMITS } from '#shared/analysis/quality'
import { defaultIndicatorSettings, type IndicatorSettings } from '#shared/pipeline/indicatorDefaults'
import type { IndicatorSettingsInput } from '#shared/schemas/indicatorSettings'
import { changedFields } from '#shared/utils/changedFields'
import { indicatorPoints, indicatorSettings, indicatorSettingsVersions, sites, tags, users } from '../../db/schema'

export const SETTINGS_KEYS = ['windowSamples', 'detrendBandwidthS', 'trendWindowSamples', 'minTrendSamples', 'indicatorStep',
  'evaluateEvery', 'surrogates', 'alpha'] as const satisfies readonly (keyof IndicatorSettings)[]

const pick = (row: IndicatorSettings): IndicatorSettings =>
  Object.fromEntries(SETTINGS_KEYS.map(k => [k, row[k]])) as unknown as IndicatorSettings

/** The tag with its site's zone, the settings in force (or the starting values) and the row behind them. */
export async function findTagSettings(db: DbExecutor, tagId: number) {
  const [row] = await db.select({ tag: tags, timeZone: sites.timeZone, stored: indicatorSettings }).from(tags)
    .innerJoin(sites, eq(sites.id, tags.siteId))
    .leftJoin(indicatorSettings, eq(indicatorSettings.tagId, tags.id))
    .where(eq(tags.id, tagId))
  if (!row) return undefined
  const defaults = defaultIndicatorSettings(row.tag.samplePeriodS)
  return { ...row, defaults, current: row.stored ? pick(row.stored) : defaults }
}

/** What the settings screen shows: current values, defaults, fixed limits and the version history. */
export async function readTagSettings(db: Db, tagId: number) {
  const found = await findTagSettings(db, tagId)
  if (!found) return undefined
  const [versions, points] = await Promise.all([
    db.select({ id: indicatorSettingsVersions.id, settings: indicatorSettingsVersions.settings, reason: indicatorSettingsVersions.reason,
      createdAt: indicatorSettingsVersions.createdAt, createdBy: users.name })
      .from(indicatorSettingsVersions).leftJoin(users, eq(users.id, indicatorSettingsVersions.createdBy))
      .where(eq(indicatorSettingsVersions.tagId, tagId)).orderBy(desc(indicatorSettingsVersions.id)),
    db.$sql<{ versionId: number | null, count: number, from: Date, to: Date }[]>`
      select settings_version_id as "versionId", count(*)::int as count, min(time) as "from", max(time) as "to"
      from indicator_points where tag_id = ${tagId} group by settings_version_id`,
  ])
  const { minSamples, minDistinctLevels, minSdInSteps, maxRepeatFraction, maxCollinearFraction } = DEFAULT_QUALITY_LIMITS
  return {
    tag: {
      id: found.tag.id, code: found.tag.code, description: found.tag.description,
      samplePeriodS: found.tag.samplePeriodS, engineeringUnit: found.tag.engineeringUnit,
    },
    timeZone: found.timeZone,
    current: found.current,
    defaults: found.defaults,
    versionId: found.stored?.versionId ?? null,
    // The gate's limits are the engine's own (shared/analysis/quality.ts), the same for every tag;
    // the gap limit follows the sample period (10 Δ).
    qualityLimits: {
      minSamples, minDistinctLevels, minSdInSteps, maxRepeatFraction, maxCollinearFraction,
      maxGapSeconds: 10 * found.tag.samplePeriodS,
    },
    versions,
    pointsByVersion: points,
  }
}

/**
 * Saves a new version of a tag's settings and makes it current. The first edit also records the
 * starting values the pipeline used until then and names them on the points they produced, so
 * every stored indicator point can be traced to its settings.
 */
export async function saveTagSettings(tx: DbTransaction, tagId: number, settings: IndicatorSettingsInput, reason: string, userId: number) {
  const [locked] = await tx.select({ id: tags.id }).from(tags).where(eq(tags.id, tagId)).for('update')
  if (!locked) return undefined
  const found = (await findTagSettings(tx, tagId))!
  const before = found.current
  if (found.stored && found.stored.versionId === null) {
    const [start] = await tx.insert(indicatorSettingsVersions)
      .values({ tagId, settings: before, reason: 'starting values, in force before the first edit', createdBy: null }).returning()
    await tx.update(indicatorPoints).set({ settingsVersionId: start!.id })
      .where(and(eq(indicatorPoints.tagId, tagId), isNull(indicatorPoints.settingsVersionId)))
  }
  const [version] = await tx.insert(indicatorSettingsVersions).values({ tagId, settings, reason, createdBy: userId }).returning()
  const row = { ...settings, versionId: version!.id, updatedAt: new Date(), updatedBy: userId }
  await tx.insert(indicatorSettings).values({ tagId, ...row })
    .onConflictDoUpdate({ target: indicatorSettings.tagId, set: row })
  return { versionId: version!.id, changed: changedFields(before, settings, SETTINGS_KEYS) }
}

