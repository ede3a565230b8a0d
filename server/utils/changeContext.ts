import { DEFAULT_NOTIFY_MAX_AGE_MINUTES } from '#shared/alarms/historyNotice'

/** Who acts (null = the system), the public address links in messages point to, and the mail age rule. */
export function changeContext(userId: number | null): ChangeContext {
  const config = useRuntimeConfig()
  return { userId, publicUrl: config.publicUrl, notifyMaxAgeMinutes: Number(config.notify?.maxAgeMinutes ?? DEFAULT_NOTIFY_MAX_AGE_MINUTES) }
}
