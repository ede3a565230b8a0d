import { SERIES_RANGES, type SeriesRange } from '#shared/schemas/series'
import type { IndicatorSettingsInput } from '#shared/schemas/indicatorSettings'
import { buildSettingsPreview, previewLeadSeconds } from '#shared/utils/settingsPreview'
import { loadSamplesSince } from '../reads/tagSeriesRead'
import { findTagSettings } from './settings'

/** Display buckets of the preview charts: fewer than the tag page, it is computed twice. */
const PREVIEW_POINTS = 300

/**
 * The preview over the tag's most recent stored history (ending at its newest sample, so a tag
 * filled from an uploaded file previews too): current settings beside the proposed ones.
 */
export async function previewTagSettings(db: Db, tagId: number, proposed: IndicatorSettingsInput, range: SeriesRange) {
  const found = await findTagSettings(db, tagId)
  if (!found) return undefined
  const [newest] = await db.$sql<{ t: number | null }[]>`select extract(epoch from max(time))::float8 as t from samples where tag_id = ${tagId}`
  const to = (newest?.t ?? Date.now() / 1000) + 1
  const from = to - SERIES_RANGES[range]
  const period = found.tag.samplePeriodS
  const { times, values } = await loadSamplesSince(db, tagId, from - previewLeadSeconds(period, found.current, proposed))
  const preview = buildSettingsPreview({
    times, values, grid: { from, to, count: PREVIEW_POINTS }, samplePeriodS: period, seed: tagId, current: found.current, proposed,
  })
  return { from, to, range, timeZone: found.timeZone, settings: { current: found.current, proposed }, ...preview }
}
