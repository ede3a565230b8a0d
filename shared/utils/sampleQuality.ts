// Sample quality as stored (smallint) and as gateways send it. Three levels, as in the common
// good / uncertain / bad status of field instruments [common practice].
export const QUALITY_CODES = { good: 0, uncertain: 1, bad: 2 } as const
export type QualityName = keyof typeof QUALITY_CODES
export const QUALITY_NAMES: readonly QualityName[] = ['good', 'uncertain', 'bad']
