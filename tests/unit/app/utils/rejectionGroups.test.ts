import { describe, expect, it } from 'vitest'
import { groupRejections, rejectionsCsv } from '../../../../app/utils/rejectionGroups'

const line = (n: number, reason: string) => ({ line: n, column: 'tag', value: 'XX', reason })

describe('groupRejections', () => {
  it('counts each reason, commonest first, with the first lines as examples', () => {
    const rejections = [line(2, 'b'), ...Array.from({ length: 5 }, (_, i) => line(3 + i, 'a')), line(9, 'b')]
    const groups = groupRejections(rejections, undefined, 3)
    expect(groups.map(g => [g.reason, g.count])).toEqual([['a', 5], ['b', 2]])
    expect(groups[0]!.examples.map(e => e.line)).toEqual([3, 4, 5])
  })
  it('takes the import\'s counts over the whole file, and names causes seen only past the listed lines', () => {
    const listed = [line(2, 'a'), line(3, 'a')]
    const groups = groupRejections(listed, [{ cause: 'a', count: 1_500 }, { cause: 'b', count: 7 }])
    expect(groups.map(g => [g.reason, g.count, g.examples.length])).toEqual([['a', 1_500, 2], ['b', 7, 0]])
  })
  it('groups values beyond a bound as one cause however the cells read', () => {
    const beyond = (n: number, v: string) => ({ line: n, column: 'Value', value: v, reason: `${Number(v)} is beyond the physical bound of this tag (range 0–100; refused outside -100–200)` })
    const groups = groupRejections([beyond(2, '250'), beyond(3, '300.50'), beyond(4, '999')])
    expect(groups).toHaveLength(1)
    expect(groups[0]!.count).toBe(3)
  })
  it('writes every listed line to the CSV with a header', () => {
    const csv = rejectionsCsv([line(2, 'unknown tag code "XX" at this site')])
    expect(csv).toBe('line,column,value,reason\r\n2,tag,XX,"unknown tag code ""XX"" at this site"\r\n')
  })
})
