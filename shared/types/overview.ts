import type { TagStatus } from '../alarms/vocabulary'

/** One tile of the overview: what an operator reads about a tag at a glance. */
export interface OverviewTile {
  id: number, code: string, description: string, engineeringUnit: string
  /** Decimals for this tag's values, from its instrument range (shared/utils/numberText.ts). */
  decimals: number
  status: TagStatus, reason: string
  value: number | null, valueTime: string | null
  /** Newest samples averaged in small groups, oldest first. */
  spark: number[]
  leadingIndicator: string | null, leadingValue: number | null, tau: number | null, pValue: number | null
  /** Newest sample at which τ and p were last computed; they stand still between two tests. */
  trendTestedAt: string | null
  /** Seconds of samples between two trend tests (evaluate_every × sample period): 10 min for a 30 s tag. */
  trendEverySeconds: number
  fold: { kind: 'projected', seconds: number, lowSeconds: number | null, highSeconds: number | null } | { kind: 'none' }
  /** Unacknowledged alarms, returned-to-normal ones included. */
  unackedAlarms: number
  /** Of those, how many have returned to normal and only await acknowledgement. */
  returnedUnacked: number
  /** The operator action of the most severe standing (annunciated) alarm, if any. */
  action: string | null
  /** Alarms on the tag set aside by shelving, suppression or removal from service (ISA-101: always visible). */
  setAside: SetAsideAlarm[]
}

export interface SetAsideAlarm {
  alarmId: number
  state: 'shelved' | 'suppressed' | 'out_of_service'
  name: string
  /** Whether the alarm's condition holds now: an excursion hidden from annunciation. */
  conditionActive: boolean
  /** End of the shelve; null for suppression and out of service. */
  until: string | null
}

export interface OverviewUnit { id: number, code: string, name: string, tiles: OverviewTile[] }
