// How long to wait before the next attempt after a failed send.

export interface BackoffSettings {
  initialMs: number
  maxMs: number
}

/**
 * Exponential backoff with "equal jitter": half the exponential delay plus a random part up to
 * the other half, so many gateways coming back after an outage do not retry in lock-step, yet
 * never retry at once [common practice].
 */
export function backoffDelay(failures: number, settings: BackoffSettings, random: () => number): number {
  const exponential = Math.min(settings.maxMs, settings.initialMs * 2 ** Math.max(0, failures - 1))
  return exponential / 2 + random() * exponential / 2
}

/**
 * Retry-After as milliseconds: delta-seconds or an HTTP-date (RFC 9110 §10.2.3).
 * Returns undefined when the header is absent or unreadable.
 */
export function parseRetryAfter(header: string | null, now = Date.now()): number | undefined {
  if (!header) return undefined
  const trimmed = header.trim()
  if (/^\d+$/.test(trimmed)) return Number(trimmed) * 1000
  const date = Date.parse(trimmed)
  return Number.isNaN(date) ? undefined : Math.max(0, date - now)
}
