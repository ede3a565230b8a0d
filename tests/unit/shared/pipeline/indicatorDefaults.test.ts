import { describe, expect, it } from 'vitest'
import {
  defaultIndicatorSettings, FALSE_ALERT_BUDGET_PER_TAG_DAY, FALSE_ALERTS_PER_WINDOW_PER_ALPHA, slidingLookAlpha,
} from '../../../../shared/pipeline/indicatorDefaults'

// The sliding look's α spends a false-alert budget per tag-day (docs/science.md §S8.2): the
// expected false alerts per day, α × trend windows per day × alerts per window per α, must come
// out at the budget whatever the sample period, unless the tag's own α caps it.
describe('slidingLookAlpha', () => {
  const expectedPerDay = (period: number) => {
    const s = defaultIndicatorSettings(period)
    const windowsPerDay = 86_400 / (s.trendWindowSamples * period)
    return slidingLookAlpha(s, period) * windowsPerDay * FALSE_ALERTS_PER_WINDOW_PER_ALPHA
  }

  it('gives 1 s, 5 s and 30 s tags the same expected false alerts per day', () => {
    for (const period of [1, 5, 30]) expect(expectedPerDay(period)).toBeCloseTo(FALSE_ALERT_BUDGET_PER_TAG_DAY, 12)
  })

  it('never exceeds the tag α, so a slow tag keeps the α its engineer set', () => {
    const slow = defaultIndicatorSettings(600)
    expect(slidingLookAlpha(slow, 600)).toBe(slow.alpha)
    expect(slidingLookAlpha({ ...slow, alpha: 1e-4 }, 600)).toBe(1e-4)
  })

  it('scales with the budget', () => {
    const s = defaultIndicatorSettings(1)
    expect(slidingLookAlpha(s, 1, 2 * FALSE_ALERT_BUDGET_PER_TAG_DAY)).toBeCloseTo(2 * slidingLookAlpha(s, 1), 15)
  })
})
