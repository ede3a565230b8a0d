import type { StageTimer } from '#shared/pipeline/evaluateRecord'

/** Accumulates wall time per named stage of a pipeline tick (for the tick report and the bench). */
export class StageClock {
  readonly totals = new Map<string, number>()

  private add(stage: string, ms: number): void {
    this.totals.set(stage, (this.totals.get(stage) ?? 0) + ms)
  }

  /** For pure, synchronous stages (passed into the engine). */
  readonly sync: StageTimer = (stage, work) => {
    const start = performance.now()
    try { return work() }
    finally { this.add(stage, performance.now() - start) }
  }

  async run<T>(stage: string, work: () => Promise<T>): Promise<T> {
    const start = performance.now()
    try { return await work() }
    finally { this.add(stage, performance.now() - start) }
  }

  report(): Record<string, number> {
    return Object.fromEntries([...this.totals].map(([k, v]) => [k, Math.round(v * 10) / 10]))
  }
}
