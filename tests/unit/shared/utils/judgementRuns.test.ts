import { describe, expect, it } from 'vitest'
import { judgementRuns } from '../../../../shared/utils/judgementRuns'

// Check values follow from the definition (a run is a maximal stretch of consecutive evaluations
// with the verdict), worked by hand on the sequences below.
describe('judgementRuns', () => {
  it('finds each maximal stretch, a single evaluation and one still open at the end', () => {
    const time = [0, 10, 20, 30, 40, 50, 60, 70]
    const evidence = ['no trend', 'slowing down', 'slowing down', null, 'slowing down', 'noise level changed', 'slowing down', 'slowing down']
    expect(judgementRuns(time, evidence)).toEqual([{ from: 10, to: 20 }, { from: 40, to: 40 }, { from: 60, to: 70 }])
  })
  it('is empty when the verdict never came', () => {
    expect(judgementRuns([0, 10], ['no trend', null])).toEqual([])
    expect(judgementRuns([], [])).toEqual([])
  })
})
