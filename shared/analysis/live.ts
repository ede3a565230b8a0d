// One tag's live indicator state: each new sample is detrended causally and pushed into the
// rolling window, so a refresh costs O(new samples), not O(window).
import { CausalTrendFilter } from './causalTrend'
import { RollingWindow } from './rolling'
import type { DetrendSpec, Indicators, WindowSpec } from './types'

/** The detrending choices whose residuals are final when computed (a centred smoother's are not). */
export type LiveDetrendSpec = Extract<DetrendSpec, { kind: 'none' } | { kind: 'localLinear' }>

export class LiveTagIndicators {
  private readonly window: RollingWindow
  private readonly trend: CausalTrendFilter | null

  constructor(window: WindowSpec, detrend: LiveDetrendSpec) {
    this.window = new RollingWindow(window)
    this.trend = detrend.kind === 'localLinear' ? new CausalTrendFilter(detrend.bandwidth) : null
  }

  /** Adds one raw sample; returns its residual. */
  push(time: number, value: number): number {
    const residual = this.trend ? value - this.trend.push(time, value) : value
    this.window.push(time, residual, value)
    return residual
  }

  get size(): number {
    return this.window.size
  }

  /** Indicators of the current window. */
  indicators(): Indicators {
    return this.window.indicators()
  }

  /** The window's residuals, oldest first (a copy), e.g. for a surrogate trend test. */
  residuals(): Float64Array {
    return this.window.residualValues()
  }
}
