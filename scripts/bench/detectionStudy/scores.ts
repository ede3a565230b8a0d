// The study's scores, per model and per null kind, for both procedures side by side.
import { DAKOS_ALPHA } from './dakosTrend'
import type { TipProjection } from './liveProcedure'
import type { RecordLength } from './recordSets'
import { PRODUCT_ALPHA, type RecordOutcome } from './scoreRecord'
import { median, rocAuc, wilson, type Auc, type Rate } from './stats'

const rate = (outcomes: readonly RecordOutcome[], holds: (o: RecordOutcome) => boolean): Rate =>
  wilson(outcomes.filter(holds).length, outcomes.length)

/** When the system actually tipped: its noise-induced escape if that came first, else the bifurcation. */
export const tipTime = (o: RecordOutcome) => o.meta.escapeTime ?? o.meta.bifurcationTime!

const dakosProjection = (o: RecordOutcome): TipProjection | null => (o.dakosFold.kind === 'projected' ? o.dakosFold : null)
const onlineAlerts = (o: RecordOutcome, alpha: number) => o.online?.byAlpha.get(alpha)?.alerts ?? []

export interface DiscriminationRow {
  model: string
  length: RecordLength
  live: Auc
  /** Records whose last evaluation had no trend test (scored as p = 1). */
  liveUnscored: number
  dakosTau: Auc
  dakosP: Auc
}

/** ROC AUC of forced records against the same model held at its start. */
export function discrimination(forced: readonly RecordOutcome[], nulls: readonly RecordOutcome[]): Omit<DiscriminationRow, 'model' | 'length'> {
  const liveScore = (o: RecordOutcome) => o.live.score ?? 0
  return {
    live: rocAuc(forced.map(liveScore), nulls.map(liveScore)),
    liveUnscored: [...forced, ...nulls].filter(o => o.live.score === null).length,
    dakosTau: rocAuc(forced.map(o => o.dakos.tauAr1), nulls.map(o => o.dakos.tauAr1)),
    dakosP: rocAuc(forced.map(o => 1 - o.dakos.pAr1), nulls.map(o => 1 - o.dakos.pAr1)),
  }
}

export interface AlertRates {
  liveAny: Rate
  liveSustained: Rate
  dakos05: Rate
  dakos01: Rate
  /** The baseline as a monitor (long records only). */
  onlineAny05: Rate | null
  onlineSustained05: Rate | null
}

/** On forced records these are detections, on nulls false positives. */
export function alertRates(outcomes: readonly RecordOutcome[]): AlertRates {
  const long = outcomes.filter(o => o.online !== null)
  return {
    liveAny: rate(outcomes, o => o.live.alerts.length > 0),
    liveSustained: rate(outcomes, o => o.live.activeAtEnd),
    dakos05: rate(outcomes, o => o.dakos.pAr1 <= DAKOS_ALPHA),
    dakos01: rate(outcomes, o => o.dakos.pAr1 <= PRODUCT_ALPHA),
    onlineAny05: long.length ? rate(long, o => onlineAlerts(o, DAKOS_ALPHA).length > 0) : null,
    onlineSustained05: long.length ? rate(long, o => o.online!.byAlpha.get(DAKOS_ALPHA)!.activeAtEnd) : null,
  }
}

export interface TipScores {
  given: Rate
  /** Of the projections given: the band holds the bifurcation time. */
  covers: Rate
  /** Of the projections given: closer to the bifurcation than "it tips at the last sample". */
  beatsNaive: Rate
  /** |projected − true| / |last sample − true|, median over projections. */
  medianRelativeError: number
}

function tipScores(outcomes: readonly RecordOutcome[], projection: (o: RecordOutcome) => TipProjection | null): TipScores {
  const given = outcomes.filter(o => projection(o) !== null)
  const truth = (o: RecordOutcome) => o.meta.bifurcationTime!
  const error = (o: RecordOutcome) => Math.abs(projection(o)!.tip - truth(o))
  const naive = (o: RecordOutcome) => Math.abs(o.meta.lastTime - truth(o))
  return {
    given: rate(outcomes, o => projection(o) !== null),
    covers: rate(given, o => projection(o)!.low <= truth(o) && truth(o) <= projection(o)!.high),
    beatsNaive: rate(given, o => error(o) < naive(o)),
    medianRelativeError: median(given.map(o => error(o) / naive(o))),
  }
}

export interface LeadTimes {
  /** Seconds from the first alert to the tip, over detected records. */
  seconds: number[]
  /** The same in characteristic times. */
  tau: number[]
}

function leads(outcomes: readonly RecordOutcome[], firstAlert: (o: RecordOutcome) => number | null): LeadTimes {
  const detected = outcomes.map(o => ({ o, at: firstAlert(o) })).filter(d => d.at !== null)
  const seconds = detected.map(d => tipTime(d.o) - d.at!)
  return { seconds, tau: detected.map((d, k) => seconds[k]! / d.o.meta.tau0!) }
}

export interface ForcedScores {
  live: { tip: TipScores, lead: LeadTimes }
  dakos: { tip: TipScores, lead: LeadTimes }
  escaped: number
}

/**
 * Lead time: live from its first raise; the baseline from its first online raise on long records
 * and, on short ones, from the record's end (a whole-record test can only speak there).
 */
export function forcedScores(forced: readonly RecordOutcome[]): ForcedScores {
  const dakosFirst = (o: RecordOutcome) => {
    if (o.online) return onlineAlerts(o, DAKOS_ALPHA)[0] ?? null
    return o.dakos.pAr1 <= DAKOS_ALPHA ? o.meta.lastTime : null
  }
  return {
    live: { tip: tipScores(forced, o => o.live.fold), lead: leads(forced, o => o.live.alerts[0] ?? null) },
    dakos: { tip: tipScores(forced, dakosProjection), lead: leads(forced, dakosFirst) },
    escaped: forced.filter(o => o.meta.escapeTime !== null).length,
  }
}

/** Nulls that projected no tip: the answer they should give. */
export function noFoldInView(nulls: readonly RecordOutcome[]): { live: Rate, dakos: Rate } {
  return { live: rate(nulls, o => o.live.fold === null), dakos: rate(nulls, o => dakosProjection(o) === null) }
}

export interface StreamCounts {
  streams: number
  seconds: number
  liveRaises: number
  dakosRaises05: number
  dakosRaises01: number
}

/** Raises over long null streams, for false alerts per tag-day. */
export function streamCounts(longNulls: readonly RecordOutcome[]): StreamCounts {
  return {
    streams: longNulls.length,
    seconds: longNulls.reduce((s, o) => s + o.meta.lastTime + 1, 0),
    liveRaises: longNulls.reduce((s, o) => s + o.live.alerts.length, 0),
    dakosRaises05: longNulls.reduce((s, o) => s + onlineAlerts(o, DAKOS_ALPHA).length, 0),
    dakosRaises01: longNulls.reduce((s, o) => s + onlineAlerts(o, PRODUCT_ALPHA).length, 0),
  }
}
