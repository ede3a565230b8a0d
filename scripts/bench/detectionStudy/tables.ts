// The study's printed tables: both procedures side by side on the same records, misses listed.
import { poissonUpper95 } from '../../../shared/analysis/calibration'
import { DAKOS_ALPHA } from './dakosTrend'
import { formatAuc, formatNumber, formatRate, printTable } from './format'
import { BENCH_MODELS } from './models'
import { NULL_KINDS } from './nullSeries'
import type { RecordLength } from './recordSets'
import { PRODUCT_ALPHA, type RecordOutcome } from './scoreRecord'
import { alertRates, discrimination, forcedScores, noFoldInView, streamCounts, type AlertRates, type TipScores } from './scores'
import { median } from './stats'

const LENGTHS: readonly RecordLength[] = ['short', 'long']
const DAY_S = 86_400

interface Sets {
  forced: RecordOutcome[]
  ownNull: RecordOutcome[]
}

function modelSets(outcomes: readonly RecordOutcome[], model: string, length: RecordLength): Sets {
  const mine = outcomes.filter(o => o.meta.group === model && o.meta.length === length)
  return { forced: mine.filter(o => o.meta.forced), ownNull: mine.filter(o => o.meta.modelNull) }
}

/** Every model at every length that has records. */
function eachModelSet(outcomes: readonly RecordOutcome[]): { model: string, length: RecordLength, sets: Sets }[] {
  return LENGTHS.flatMap(length => BENCH_MODELS.map(m => ({ model: m.name, length, sets: modelSets(outcomes, m.name, length) })))
    .filter(s => s.sets.forced.length > 0)
}

/** Null kinds in print order: each model held fixed, then the AR(1)-based kinds. */
function eachNullSet(outcomes: readonly RecordOutcome[]): { name: string, length: RecordLength, nulls: RecordOutcome[] }[] {
  const names = [...BENCH_MODELS.map(m => m.name), ...NULL_KINDS.map(k => k.name)]
  return LENGTHS.flatMap(length => names.map(name => ({
    name: BENCH_MODELS.some(m => m.name === name) ? `${name} at p0` : name,
    length,
    nulls: outcomes.filter(o => !o.meta.forced && o.meta.group === name && o.meta.length === length),
  }))).filter(s => s.nulls.length > 0)
}

export function printDiscrimination(outcomes: readonly RecordOutcome[]): void {
  printTable('1. ROC AUC, forced vs the same model at its start parameter (whole record; [95% CI, Hanley–McNeil])',
    ['model', 'len', 'forced/null', 'LIVE 1−pAr1 (last pt)', 'no score', 'Dakos τ(AR1)', 'Dakos 1−p(AR1)'],
    eachModelSet(outcomes).map(({ model, length, sets }) => {
      const d = discrimination(sets.forced, sets.ownNull)
      return [model, length, `${sets.forced.length}/${sets.ownNull.length}`, formatAuc(d.live), String(d.liveUnscored), formatAuc(d.dakosTau), formatAuc(d.dakosP)]
    }))
}

// The rate columns tables 2 and 3 share.
const rateCells = (r: AlertRates) => [
  formatRate(r.liveAny), formatRate(r.liveSustained), formatRate(r.dakos05), formatRate(r.dakos01),
  formatRate(r.onlineAny05), formatRate(r.onlineSustained05),
]

export function printDetection(outcomes: readonly RecordOutcome[]): void {
  printTable(`2. Detection on forced records [Wilson 95%]: LIVE alert raised / still active at the end; Dakos p(AR1) ≤ ${DAKOS_ALPHA} and ≤ ${PRODUCT_ALPHA} (product α); Dakos as monitor at α=${DAKOS_ALPHA} (long)`,
    ['model', 'len', 'LIVE any alert', 'LIVE active at end', `Dakos α=${DAKOS_ALPHA}`, `Dakos α=${PRODUCT_ALPHA}`, 'monitor any', 'monitor at end'],
    eachModelSet(outcomes).map(({ model, length, sets }) => {
      const r = alertRates(sets.forced)
      return [model, length, ...rateCells(r)]
    }))
}

/** Bins of how far before the bifurcation the data stop, in characteristic times τ at the start. */
const STOP_BINS: readonly [number, number][] = [[0, 25], [25, 50], [50, 100], [100, Infinity]]

/**
 * Detection against distance to the tip. Forced records stop U(0, MAX_STOP_TAU)τ before the
 * bifurcation, so the pooled rate of table 2 mixes records that end at the fold with records that
 * end where no method can see it yet; this splits it, for both procedures on the same records.
 */
export function printDetectionByDistance(outcomes: readonly RecordOutcome[]): void {
  printTable(`2b. Detection on short forced records by where the data stop before the bifurcation [Wilson 95%]`,
    ['model', 'data stop', 'LIVE any alert', `Dakos α=${DAKOS_ALPHA}`, `Dakos α=${PRODUCT_ALPHA}`],
    shortRecordsByDistance(outcomes, (inBin) => {
      const r = alertRates(inBin)
      return [formatRate(r.liveAny), formatRate(r.dakos05), formatRate(r.dakos01)]
    }))
}

/** One row per model and STOP_BINS bin of the short forced records, its cells from `cells`. */
function shortRecordsByDistance(outcomes: readonly RecordOutcome[], cells: (inBin: RecordOutcome[]) => string[]): string[][] {
  return eachModelSet(outcomes).filter(s => s.length === 'short').flatMap(({ model, sets }) =>
    STOP_BINS.map(([low, high]) => {
      const inBin = sets.forced.filter(o => o.meta.stopBeforeTau! >= low && o.meta.stopBeforeTau! < high)
      const bin = Number.isFinite(high) ? `${low}–${high}τ` : `≥ ${low}τ`
      return [model, bin, ...cells(inBin)]
    }))
}

export function printFalsePositives(outcomes: readonly RecordOutcome[]): void {
  printTable('3. False positives per null kind [Wilson 95%] (same columns as table 2; "monitor" = Dakos re-run online at α=0.05)',
    ['null kind', 'len', 'LIVE any alert', 'LIVE active at end', `Dakos α=${DAKOS_ALPHA}`, `Dakos α=${PRODUCT_ALPHA}`, 'monitor any', 'monitor at end'],
    eachNullSet(outcomes).map(({ name, length, nulls }) => {
      const r = alertRates(nulls)
      return [name, length, ...rateCells(r)]
    }))
}

const leadCell = (lead: { seconds: number[], tau: number[] }) =>
  lead.seconds.length ? `${formatNumber(median(lead.seconds))} s = ${formatNumber(median(lead.tau))}τ (n=${lead.seconds.length})` : '— (n=0)'

export function printLeadTimes(outcomes: readonly RecordOutcome[]): void {
  printTable('4. Median lead time, tip − first alert (Dakos: first monitor raise on long, record end on short); escaped = tipped by noise before the data end',
    ['model', 'len', 'escaped', 'LIVE lead', 'Dakos lead'],
    eachModelSet(outcomes).map(({ model, length, sets }) => {
      const s = forcedScores(sets.forced)
      return [model, length, String(s.escaped), leadCell(s.live.lead), leadCell(s.dakos.lead)]
    }))
}

// Table 5's four columns per method.
const tipCells = (tip: TipScores) =>
  [formatRate(tip.given), formatRate(tip.covers), formatRate(tip.beatsNaive), formatNumber(tip.medianRelativeError, 2)]

export function printTipProjections(outcomes: readonly RecordOutcome[]): void {
  printTable('5. Tip projection at the last point on forced records: given; of those, band holds the bifurcation; beats "tip = last sample"; median |error|/|naive error|',
    ['model', 'len', 'LIVE given', 'LIVE band covers', 'LIVE beats naive', 'rel.err', 'Dakos given', 'Dakos band covers', 'Dakos beats naive', 'rel.err'],
    eachModelSet(outcomes).map(({ model, length, sets }) => {
      const { live, dakos } = forcedScores(sets.forced)
      return [model, length, ...tipCells(live.tip), ...tipCells(dakos.tip)]
    }))
}

/** Table 5 split as table 2b: where the data stop decides whether a horizon can be given at all. */
export function printTipProjectionsByDistance(outcomes: readonly RecordOutcome[]): void {
  printTable('5b. Tip projection on short forced records by where the data stop before the bifurcation (columns as table 5)',
    ['model', 'data stop', 'LIVE given', 'LIVE band covers', 'LIVE beats naive', 'rel.err', 'Dakos given', 'Dakos band covers', 'Dakos beats naive', 'rel.err'],
    shortRecordsByDistance(outcomes, (inBin) => {
      const { live, dakos } = forcedScores(inBin)
      return [...tipCells(live.tip), ...tipCells(dakos.tip)]
    }))
}

export function printNoFoldOnNulls(outcomes: readonly RecordOutcome[]): void {
  printTable('6. "No fold in view" at the last point on nulls (higher is better)',
    ['null kind', 'len', 'LIVE', 'Dakos'],
    eachNullSet(outcomes).map(({ name, length, nulls }) => {
      const r = noFoldInView(nulls)
      return [name, length, formatRate(r.live), formatRate(r.dakos)]
    }))
}

export function printStreamRates(outcomes: readonly RecordOutcome[]): void {
  const longNulls = outcomes.filter(o => !o.meta.forced && o.meta.length === 'long')
  if (longNulls.length === 0) return
  const c = streamCounts(longNulls)
  // Windows and delays are counted in samples, so the same decisions hold at any sample period;
  // only the calendar time a sample stands for changes.
  const perThousandDays = (raises: number, periodS: number) => {
    const days = c.seconds * periodS / DAY_S
    return `${formatNumber(1000 * raises / days, 1)} (≤ ${formatNumber(1000 * poissonUpper95(raises) / days, 1)})`
  }
  printTable(`7. False alerts on long null streams: ${c.streams} streams, ${c.seconds} samples = ${(c.seconds / DAY_S).toFixed(2)} tag-days at 1 s/sample; per 1,000 tag-days (one-sided 95% Poisson upper bound)`,
    ['procedure', 'raises', 'per 1,000 tag-days at 1 s', 'if sampled every 60 s'],
    [
      ['LIVE slowing-down alert', String(c.liveRaises), perThousandDays(c.liveRaises, 1), perThousandDays(c.liveRaises, 60)],
      [`Dakos monitor α=${DAKOS_ALPHA}`, String(c.dakosRaises05), perThousandDays(c.dakosRaises05, 1), perThousandDays(c.dakosRaises05, 60)],
      [`Dakos monitor α=${PRODUCT_ALPHA}`, String(c.dakosRaises01), perThousandDays(c.dakosRaises01, 1), perThousandDays(c.dakosRaises01, 60)],
    ])
}

const MAX_LISTED = 40

/** "reason ×count; …" over the non-null reasons, commonest first; bootstrap counts are pooled. */
function tally(reasons: readonly (string | null)[]): string {
  const counts = new Map<string, number>()
  for (const reason of reasons) {
    if (reason === null) continue
    const key = reason.replace(/^\d+\/\d+ /, '')
    counts.set(key, (counts.get(key) ?? 0) + 1)
  }
  return [...counts].sort((a, b) => b[1] - a[1]).map(([k, n]) => `${k} ×${n}`).join('; ') || 'none'
}

/** Every forced record a procedure missed, with how far before the tip its data stopped. */
export function printMisses(outcomes: readonly RecordOutcome[]): void {
  console.log('\n8. Misses on forced records (record id: data stop before the bifurcation in τ; e = escaped by noise)')
  const describe = (o: RecordOutcome) => `#${o.meta.id}:${formatNumber(o.meta.stopBeforeTau!)}τ${o.meta.escapeTime !== null ? 'e' : ''}`
  const list = (missed: RecordOutcome[]) => {
    const shown = [...missed].sort((a, b) => a.meta.stopBeforeTau! - b.meta.stopBeforeTau!).slice(0, MAX_LISTED).map(describe).join(' ')
    return missed.length > MAX_LISTED ? `${shown} … (+${missed.length - MAX_LISTED})` : shown || 'none'
  }
  for (const { model, length, sets } of eachModelSet(outcomes)) {
    console.log(`  ${model}, ${length}:`)
    console.log(`    LIVE  (${sets.forced.filter(o => o.live.alerts.length === 0).length} missed): ${list(sets.forced.filter(o => o.live.alerts.length === 0))}`)
    console.log(`    Dakos (${sets.forced.filter(o => o.dakos.pAr1 > DAKOS_ALPHA).length} missed at α=${DAKOS_ALPHA}): ${list(sets.forced.filter(o => o.dakos.pAr1 > DAKOS_ALPHA))}`)
    console.log(`    Dakos tip not given: ${tally(sets.forced.map(o => (o.dakosFold.kind === 'none' ? o.dakosFold.reason : null)))}`)
  }
}
