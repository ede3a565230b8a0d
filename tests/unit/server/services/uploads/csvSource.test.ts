import { Readable } from 'node:stream'
import { setTimeout as sleep } from 'node:timers/promises'
import { describe, expect, it } from 'vitest'
import { openCsvSource } from '../../../../../server/services/uploads/csvSource'

/** A CSV made on demand, counting how many bytes the reader has pulled. */
function meteredCsv(lines: number) {
  const meter = { bytes: 0 }
  async function* generate() {
    yield 'time,tag,value\n'
    for (let i = 0; i < lines; i += 1000) {
      let chunk = ''
      for (let j = i; j < i + 1000; j++) chunk += `${1_735_689_600_000 + j * 1000},TI-101,${j % 100}\n`
      meter.bytes += chunk.length
      yield chunk
    }
  }
  return { body: Readable.from(generate(), { objectMode: false }), meter }
}

describe('openCsvSource', () => {
  it('stops pulling the body while the consumer is busy (backpressure), then reads it all', async () => {
    const { body, meter } = meteredCsv(300_000)
    const source = openCsvSource(body)
    expect((await source.next())!.record).toEqual(['time', 'tag', 'value'])
    await source.next()
    await sleep(200) // a slow database write
    // ~7 MB in total; only the stream buffers' worth (well under 1 MB) may have been read ahead.
    expect(meter.bytes).toBeLessThan(1_000_000)
    let n = 2
    while (await source.next()) n++
    expect(n).toBe(300_001)
    expect(meter.bytes).toBeGreaterThan(6_000_000)
  }, 30_000)

  it('gives each record its line; a stray quote stays text instead of swallowing the next lines', async () => {
    const source = openCsvSource(Readable.from(['time,tag,value\n\n"a,b",TI-101,1\n"x"y,TI-101,2\n2025,TI-101,3\n']))
    const records: Array<[number, string]> = []
    for (let r = await source.next(); r; r = await source.next()) records.push([r.info.lines, r.record[0]!])
    expect(records).toEqual([[1, 'time'], [3, 'a,b'], [4, '"x"y'], [5, '2025']])
    expect(source.unreadable).toEqual([])
  })

  it('stops with an error naming the line when a quoted field is never closed', async () => {
    const rows = Array.from({ length: 5000 }, (_, i) => `2025-01-01T00:00:${i % 60}Z,TI-101,${i}`)
    rows[10] += ',"unclosed'
    const source = openCsvSource(Readable.from([`time,tag,value\n${rows.join('\n')}\n`]))
    let read = 0
    await expect((async () => { while (await source.next()) read++ })()).rejects.toThrow(/quoted field opened before line \d+ is never closed/)
    // The header and the ten good rows before the stray quote were all handed over first.
    expect(read).toBe(11)
  })
})
