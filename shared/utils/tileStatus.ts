import type { TagStatus } from '../alarms/vocabulary'

/** Samples stop for this many sample periods → "no data", for the tile and the pipeline alike (docs/design.md §D3). */
export const NO_DATA_PERIODS = 3
// Gateways post in batches every few seconds, so a 1 s tag's newest sample is routinely a few
// seconds old; below this floor its tile would flicker to "no data" between batches.
export const NO_DATA_FLOOR_SECONDS = 15

export interface StoredTagStatus { status: TagStatus, reason: string }

/** The most severe annunciated (unacknowledged or acknowledged, not shelved) alarm of the tag. */
export interface OpenAlarm { alarmClass: 'alarm' | 'alert', name: string }

/**
 * What a tile shows, decided at read time so it does not wait for the next pipeline run:
 * "no data" as soon as the newest sample is older than three sample periods; an annunciated
 * alarm makes it at least "alarm" (an alert at least "warning"), as the pipeline would; otherwise
 * the pipeline's status, or "steady" with "analysis pending" before the pipeline has judged it.
 */
export function tileStatus(input: {
  stored: StoredTagStatus | null, latestTimeMs: number | null, samplePeriodS: number, nowMs: number, openAlarm?: OpenAlarm | null
}): StoredTagStatus {
  const limitS = Math.max(NO_DATA_PERIODS * input.samplePeriodS, NO_DATA_FLOOR_SECONDS)
  if (input.latestTimeMs === null) return { status: 'no data', reason: 'no samples received yet' }
  const ageS = (input.nowMs - input.latestTimeMs) / 1000
  if (ageS > limitS) return { status: 'no data', reason: `no sample for ${Math.round(ageS)} s (limit ${limitS} s)` }
  const stored = input.stored?.status === 'no data' ? { status: 'steady' as const, reason: 'samples arriving again; analysis pending' } : input.stored
  if (stored?.status !== 'bad quality' && input.openAlarm) {
    if (input.openAlarm.alarmClass === 'alarm') return { status: 'alarm', reason: input.openAlarm.name }
    if (!stored || stored.status === 'steady' || stored.status === 'watch') return { status: 'warning', reason: input.openAlarm.name }
  }
  return stored ?? { status: 'steady', reason: 'analysis pending' }
}
