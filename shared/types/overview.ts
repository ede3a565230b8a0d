import type { TagStatus } from '../alarms/vocabulary'

/** One tile of the overview: what an operator reads about a tag at a glance. */
export interface OverviewTile {
  id: number, code: string, description: string, engineeringUnit: string
  status: TagStatus, reason: string
  value: number | null, valueTime: string | null
  /** Newest samples averaged in small groups, oldest first. */
  spark: number[]
  leadingIndicator: string | null, leadingValue: number | null, tau: number | null, pValue: number | null
  fold: { kind: 'projected', seconds: number, lowSeconds: number | null, highSeconds: number | null } | { kind: 'none' }
  unackedAlarms: number
}

export interface OverviewUnit { id: number, code: string, name: string, tiles: OverviewTile[] }
