import { z } from 'zod'

/** Time ranges the charts offer, in seconds. */
export const SERIES_RANGES = { '1h': 3_600, '6h': 21_600, '24h': 86_400, '7d': 604_800 } as const
export type SeriesRange = keyof typeof SERIES_RANGES

const rangeField = z.enum(Object.keys(SERIES_RANGES) as [SeriesRange, ...SeriesRange[]], {
  errorMap: () => ({ message: `must be one of ${Object.keys(SERIES_RANGES).join(', ')}` }),
})

export const seriesQuerySchema = z.object({ range: rangeField.default('6h') })
export const slowModeQuerySchema = z.object({ range: rangeField.default('1h') })
