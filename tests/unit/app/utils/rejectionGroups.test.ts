import { describe, expect, it } from 'vitest'
import { groupRejections, rejectionsCsv } from '../../../../app/utils/rejectionGroups'

const line = (n: number, reason: string) => ({ line: n, column: 'tag', value: 'XX', reason })

describe('groupRejections', () => {
  it('counts each reason, commonest first, with the first lines as examples', () => {
    const rejections = [line(2, 'b'), ...Array.from({ length: 5 }, (_, i) => line(3 + i, 'a')), line(9, 'b')]
    const groups = groupRejections(rejections, 3)
    expect(groups.map(g => [g.reason, g.count])).toEqual([['a', 5], ['b', 2]])
    expect(groups[0]!.examples.map(e => e.line)).toEqual([3, 4, 5])
  })
  it('writes every listed line to the CSV with a header', () => {
    const csv = rejectionsCsv([line(2, 'unknown tag code "XX" at this site')])
    expect(csv).toBe('line,column,value,reason\r\n2,tag,XX,"unknown tag code ""XX"" at this site"\r\n')
  })
})
