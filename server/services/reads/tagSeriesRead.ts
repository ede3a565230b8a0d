import { findActivationMarks } from '../alarms/activationMarks'
import { SERIES_RANGES, type SeriesRange } from '#shared/schemas/series'
import { chartIndicatorSettings, type StoredIndicatorSettings } from '#shared/utils/chartIndicatorSettings'
import { buildTagSeries } from '#shared/utils/tagSeries'
import type { ArchivedMinutes } from '#shared/utils/timeBuckets'
import type { Db } from '../../utils/db'

// Around a thousand buckets: about one per pixel of a full-width chart.
const DISPLAY_POINTS = 1_000

export interface TagHeader {
  id: number, code: string, description: string, engineeringUnit: string, samplePeriodS: number,
  rangeLow: number, rangeHigh: number, unitId: number, unitCode: string, unitName: string
  /** The tag's row in indicator_settings, null until the pipeline or an engineer created it. */
  stored: StoredIndicatorSettings | null
}

export async function findTagHeader(db: Db, id: number): Promise<TagHeader | undefined> {
  const [row] = await db.$sql<TagHeader[]>`
    select t.id, t.code, t.description, t.engineering_unit as "engineeringUnit", t.sample_period_s as "samplePeriodS",
      t.range_low as "rangeLow", t.range_high as "rangeHigh", u.id as "unitId", u.code as "unitCode", u.name as "unitName",
      case when s.tag_id is null then null else json_build_object('windowSamples', s.window_samples,
        'detrendBandwidthS', s.detrend_bandwidth_s, 'trendWindowSamples', s.trend_window_samples,
        'minTrendSamples', s.min_trend_samples, 'indicatorStep', s.indicator_step, 'evaluateEvery', s.evaluate_every,
        'surrogates', s.surrogates, 'alpha', s.alpha) end as stored
    from tags t join units u on u.id = t.unit_id left join indicator_settings s on s.tag_id = t.id
    where t.id = ${id}`
  return row
}

/**
 * Good and uncertain samples of one tag since `fromSeconds`, oldest first, as epoch seconds.
 * Bad-quality readings are left out: the indicators must never be computed from them.
 */
export async function loadSamplesSince(db: Db, tagId: number, fromSeconds: number, toSeconds = Number.POSITIVE_INFINITY) {
  const until = Number.isFinite(toSeconds) ? db.$sql`and time <= to_timestamp(${toSeconds})` : db.$sql``
  const rows = await db.$sql`
    select extract(epoch from time)::float8, value from samples
    where tag_id = ${tagId} and time >= to_timestamp(${fromSeconds}) ${until} and quality < 2
    order by time`.values()
  const times = new Float64Array(rows.length)
  const values = new Float64Array(rows.length)
  rows.forEach((row, i) => {
    times[i] = Number(row[0])
    values[i] = Number(row[1])
  })
  return { times, values }
}

/**
 * The per-minute archive of one tag over [fromSeconds, beforeSeconds): where raw samples have
 * passed the site's raw window, a trend is drawn from these (server/services/storage/retention.ts).
 */
export async function loadArchiveBefore(db: Db, tagId: number, fromSeconds: number, beforeSeconds: number): Promise<ArchivedMinutes> {
  const rows = beforeSeconds <= fromSeconds ? [] : await db.$sql`
    select extract(epoch from minute)::float8, value_mean, value_min, value_max, samples from samples_minute
    where tag_id = ${tagId} and minute >= to_timestamp(${Math.floor(fromSeconds / 60) * 60}) and minute < to_timestamp(${beforeSeconds}) and samples > 0
    order by minute`.values()
  const column = (i: number) => Float64Array.from(rows, r => Number(r[i]))
  return { minute: column(0), mean: column(1), min: column(2), max: column(3), samples: Int32Array.from(rows, r => Number(r[4])) }
}

const CHARTED_MEASURES = ['value', 'variance', 'ar1', 'recovery_rate']

/** The tag's enabled rules on charted measures (threshold lines) and its alarms' activations in the range (markers). */
export async function findTagRuleMarks(db: Db, tagId: number, fromS: number, toS: number) {
  const [thresholds, markers] = await Promise.all([
    db.$sql<{ measure: string, threshold: number, comparison: string, priority: string, name: string }[]>`
      select measure, threshold, comparison, priority, name from alarm_rules
      where tag_id = ${tagId} and enabled and mode <> 'out_of_service' and measure = any(${db.$sql.array(CHARTED_MEASURES)}::text[])`,
    findActivationMarks(db, { tagId }, fromS, toS),
  ])
  return { thresholds, markers }
}

/** The tag-detail charts for the range ending now, or undefined for an unknown tag. */
export async function readTagSeries(db: Db, tagId: number, range: SeriesRange, nowMs = Date.now()) {
  const to = nowMs / 1000
  const view = await readTagSeriesBetween(db, tagId, to - SERIES_RANGES[range], to)
  return view && { ...view, range }
}

/**
 * The tag's charts over [from, to] (epoch seconds), or undefined for an unknown tag. No bucket is
 * narrower than the tag's sample period: a 30 s tag over 6 h (21.6 s buckets) left every third
 * bucket empty, and the gaps drew every line dotted and broken; a short span (an incident) the same.
 */
export async function readTagSeriesBetween(db: Db, tagId: number, from: number, to: number) {
  const tag = await findTagHeader(db, tagId)
  if (!tag) return undefined
  const settings = chartIndicatorSettings(tag.samplePeriodS, tag.stored)
  // One window (and the trend filter's warm-up) before the range, so the indicators cover the
  // whole displayed range, and at least the live trend window before its end, so the judgement at
  // the newest sample sees what the live pipeline saw.
  const period = tag.samplePeriodS
  const judged = (settings.live.trendWindowSamples * period) + settings.live.detrendBandwidthS
  // Samples after the range's end are left out: the view is the range as it was then.
  const { times, values } = await loadSamplesSince(
    db, tagId, Math.min(from - settings.windowSeconds - settings.live.detrendBandwidthS, to - judged), to,
  )
  // Older than the oldest raw sample left, the range is drawn from the archive, if it has it.
  const archive = await loadArchiveBefore(db, tagId, from, times.length ? Math.min(times[0]!, to) : to)
  const count = Math.max(2, Math.min(DISPLAY_POINTS, Math.floor((to - from) / period)))
  const view = buildTagSeries({ times, values, grid: { from, to, count }, settings, seed: tagId, archive })
  const rules = await findTagRuleMarks(db, tagId, from, to)
  const { stored: _stored, ...header } = tag
  return {
    tag: header,
    from,
    to,
    latest: times.length ? { time: times[times.length - 1]!, value: values[values.length - 1]! } : null,
    settings: {
      windowSamples: settings.window.samples, windowSeconds: settings.windowSeconds, detrend: settings.detrend,
      alpha: settings.live.alpha, fromTag: tag.stored !== null,
    },
    ...view,
    ...rules,
  }
}
