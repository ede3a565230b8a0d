// Turns a simulated unit into timestamped samples: ticks the plant in wall-clock steps and reads
// each tag through its sensor whenever its sample period comes round. Timestamps sit on whole
// multiples of the period, so a resent sample has exactly the same (tag, time) key.
import type { CatalogueUnit } from '../../shared/demo/catalogue'
import type { SimulatedUnit } from '../units/simulatedUnit'
import type { IngestSample } from './ingestClient'
import type { Normal } from './random'
import { readSensor } from './sensor'

function greatestCommonDivisor(a: number, b: number): number {
  return b === 0 ? a : greatestCommonDivisor(b, a % b)
}

export class UnitSampler {
  readonly tickMs: number
  private nextTickMs: number

  constructor(
    readonly unit: SimulatedUnit,
    private readonly catalogue: CatalogueUnit,
    private readonly sensorNormal: Normal,
    startMs: number,
  ) {
    this.tickMs = catalogue.tags.map(t => t.samplePeriodSeconds * 1000).reduce(greatestCommonDivisor)
    this.nextTickMs = (Math.floor(startMs / this.tickMs) + 1) * this.tickMs
  }

  /** Every sample due up to and including `untilMs`, advancing the plant as it goes. */
  samplesUntil(untilMs: number): IngestSample[] {
    const samples: IngestSample[] = []
    for (; this.nextTickMs <= untilMs; this.nextTickMs += this.tickMs) {
      this.unit.advance(this.tickMs / 1000)
      const values = this.unit.trueValues()
      const time = new Date(this.nextTickMs).toISOString()
      for (const tag of this.catalogue.tags) {
        if (this.nextTickMs % (tag.samplePeriodSeconds * 1000) !== 0) continue
        const reading = readSensor(values[tag.code]!, tag, this.sensorNormal)
        samples.push({ tag: tag.code, time, ...reading })
      }
    }
    return samples
  }
}
