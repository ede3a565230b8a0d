import { MAX_REPLAY_SAMPLES } from '#shared/schemas/replay'
import type { RejectedSample } from '#shared/utils/sampleBatch'
import type { SampleSink } from '../uploads/csvImport'

/** The readings of a historian file kept for one replay, in time order (epoch ms). */
export interface ReplayFileSamples { timesMs: Float64Array, values: Float64Array, qualities: Uint8Array }

/**
 * Where the upload path puts a replay's file: in memory, for one tag. A reading of another tag
 * is refused (a replay runs one tag's settings and rules), and so is a second, different reading
 * at a time the file already gave (the first is kept, as an import keeps the stored one); an
 * identical repeat counts as a duplicate. A file with more readings than a replay evaluates
 * stops the read, so no more than that is ever held.
 */
export function replayFileCollector(tagCode: string) {
  const byTime = new Map<number, { value: number, quality: number }>()
  const store: SampleSink = async (samples) => {
    let accepted = 0
    let duplicates = 0
    const conflicts: RejectedSample[] = []
    for (const s of samples) {
      if (s.tag !== tagCode) {
        conflicts.push({ index: s.index, field: 'tag', reason: `is for ${s.tag}: this replay runs on ${tagCode} only` })
        continue
      }
      const held = byTime.get(s.timeMs)
      if (!held) {
        byTime.set(s.timeMs, { value: s.value, quality: s.quality })
        accepted++
      }
      else if (held.value === s.value && held.quality === s.quality) duplicates++
      else {
        conflicts.push({
          index: s.index, field: 'value',
          reason: `conflicts with the reading earlier in the file at ${new Date(s.timeMs).toISOString()} (value ${held.value}, quality ${held.quality}): the first is kept`,
        })
      }
    }
    if (byTime.size > MAX_REPLAY_SAMPLES)
      throw new Error(`the file holds more than ${MAX_REPLAY_SAMPLES.toLocaleString('en-GB')} readings of ${tagCode}, more than one replay evaluates`)
    return { accepted, duplicates, conflicts }
  }
  const samples = (): ReplayFileSamples => {
    const timesMs = Float64Array.from(byTime.keys()).sort()
    return {
      timesMs,
      values: Float64Array.from(timesMs, t => byTime.get(t)!.value),
      qualities: Uint8Array.from(timesMs, t => byTime.get(t)!.quality),
    }
  }
  return { store, samples }
}
