// The settings preview runs the tag-detail chart builder and the live evaluation twice over the same
// history. Checks: its looks give the live verdicts (a look's verdict does not depend on how often the
// live task looks), equal settings give equal sides, and a shorter window tracks an OU process's
// variance with more scatter (SE of a variance estimate ∝ 1/√n for an AR(1): docs/science.md §S2.3).
import { describe, expect, it } from 'vitest'
import { createRng } from '#shared/analysis/random'
import { simulateOu } from '#shared/analysis/simulate'
import { evaluateRecord } from '#shared/pipeline/evaluateRecord'
import { defaultIndicatorSettings } from '#shared/pipeline/indicatorDefaults'
import { buildSettingsPreview, PREVIEW_LOOKS, previewLeadSeconds } from '#shared/utils/settingsPreview'

const current = defaultIndicatorSettings(1)
const proposed = { ...current, windowSamples: 100, alpha: 0.01 }
// Recovery rate falling from 0.5 to 0.1 /s: the approach to a fold seen through an OU process.
const series = simulateOu({ samples: 4000, dt: 1, k: t => 0.5 - 0.4 * t / 4000, sigma: 0.2 }, createRng(7))
const grid = { from: 2000, to: 4000, count: 200 }
const preview = buildSettingsPreview({ times: series.times, values: series.values, grid, samplePeriodS: 1, seed: 3, current, proposed })

describe('indicator settings preview', () => {
  it('needs a trend window and the warm-up before the range', () => {
    expect(previewLeadSeconds(1, current, proposed)).toBe(current.trendWindowSamples + 5 * current.detrendBandwidthS)
  })

  it('looks at most PREVIEW_LOOKS times, at the same samples for both settings', () => {
    expect(preview.lookTime.length).toBeGreaterThan(0)
    expect(preview.lookTime.length).toBeLessThanOrEqual(PREVIEW_LOOKS)
    expect(preview.current.p).toHaveLength(preview.lookTime.length)
    expect(preview.proposed.p).toHaveLength(preview.lookTime.length)
    expect(preview.time).toHaveLength(grid.count)
  })

  it('each look gives the verdict and p of the live evaluation at that sample', () => {
    // The live task at its own cadence (every 20 samples), asked for one look at each of those samples.
    preview.lookTime.forEach((t, i) => {
      const at = series.times.indexOf(t)
      const [live] = evaluateRecord({
        tagId: 3, times: series.times.subarray(0, at + 1), values: series.values.subarray(0, at + 1), firstNew: at,
        samplesSinceEvaluation: current.evaluateEvery - 1, samplePeriodS: 1, settings: current,
      }).points
      expect(preview.current.p[i]).toBe(live!.pAr1)
      expect(preview.current.evidence[i]).toBe(live!.evidence)
    })
  }, 60_000)

  it('equal settings give equal sides', () => {
    const same = buildSettingsPreview(
      { times: series.times, values: series.values, grid, samplePeriodS: 1, seed: 3, current, proposed: current })
    expect(same.proposed).toEqual(same.current)
  })

  it('a shorter window scatters more about the variance trend', () => {
    const scatter = (xs: (number | null)[]) => {
      const v = xs.filter((x): x is number => x !== null)
      const diffs = v.slice(1).map((x, i) => (x - v[i]!) ** 2)
      return diffs.reduce((a, b) => a + b, 0) / diffs.length
    }
    expect(scatter(preview.proposed.variance)).toBeGreaterThan(scatter(preview.current.variance))
  })
})
