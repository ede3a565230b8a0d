import { describe, expect, it, vi } from 'vitest'
import { evaluationThreadCount } from '../../../../../server/services/pipeline/evaluationThreads'

describe('evaluationThreadCount (BRINKLINE_EVAL_THREADS)', () => {
  it('defaults to one thread per core, at least one', () => {
    expect(evaluationThreadCount(undefined, 8)).toBe(8)
    expect(evaluationThreadCount('', 2)).toBe(2)
    expect(evaluationThreadCount(undefined, 0)).toBe(1)
  })

  it('takes a whole number, 0 meaning inline', () => {
    expect(evaluationThreadCount('0', 8)).toBe(0)
    expect(evaluationThreadCount('3', 8)).toBe(3)
  })

  it('falls back to the default on anything else, with a warning', () => {
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => {})
    for (const bad of ['-1', '1.5', 'two']) expect(evaluationThreadCount(bad, 4)).toBe(4)
    expect(warn).toHaveBeenCalledTimes(3)
    warn.mockRestore()
  })
})
