import { MAX_BATCH_SAMPLES } from '../../shared/schemas/ingest'
import { createRng } from '../../shared/analysis/random'
import { simulateOu } from '../../shared/analysis/simulate'
import { ingest } from './gateway'

export interface OuTag {
  code: string
  periodS: number
  /** Samples ending at `endMs` (the newest sample's time). */
  samples: number
  endMs: number
  mean: number
  /** Recovery rate (1/s), fixed or drifting with time since the first sample. */
  k: number | ((t: number) => number)
  sigma: number
  seed: number
}

/** Posts an Ornstein–Uhlenbeck record for one tag through the ingest API, in allowed batches. */
export async function ingestOu(key: string, tag: OuTag): Promise<number> {
  const { times, values } = simulateOu({ samples: tag.samples, dt: tag.periodS, k: tag.k, sigma: tag.sigma }, createRng(tag.seed))
  const startMs = tag.endMs - (tag.samples - 1) * tag.periodS * 1000
  const samples = Array.from(times, (t, i) => ({ tag: tag.code, time: Math.round(startMs + t * 1000), value: tag.mean + values[i]! }))
  let accepted = 0
  for (let i = 0; i < samples.length; i += MAX_BATCH_SAMPLES) {
    const res = await ingest(key, { samples: samples.slice(i, i + MAX_BATCH_SAMPLES) })
    if (res.status !== 200) throw new Error(`ingest answered ${res.status}: ${JSON.stringify(res.body)}`)
    accepted += res.body.accepted
  }
  return accepted
}
