import { DEFAULT_NOTIFY_MAX_AGE_MINUTES } from '#shared/alarms/historyNotice'

/** Who made a change, where links in its messages point, and the mail age rule. */
export interface ChangeContext {
  userId: number | null
  publicUrl: string
  /** Activations older than this when recorded are from old history (no single mail); default 30. */
  notifyMaxAgeMinutes?: number
}

/** Who acts (null = the system), the public address links in messages point to, and the mail age rule. */
export function changeContext(userId: number | null): ChangeContext {
  const config = useRuntimeConfig()
  return {
    userId, publicUrl: config.publicUrl, notifyMaxAgeMinutes: Number(config.notify?.maxAgeMinutes ?? DEFAULT_NOTIFY_MAX_AGE_MINUTES),
  }
}
