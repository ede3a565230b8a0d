import { MAX_INGEST_BYTES } from '#shared/schemas/ingest'
import { INCIDENT_FINDINGS_MAX_BYTES } from '#shared/schemas/incident'
import { OPCUA_MAPPINGS_MAX_BYTES } from '#shared/schemas/opcua'
import { MAX_REPLAY_FILE_BYTES } from '#shared/schemas/replay'
import { MAX_UPLOAD_BYTES, PREVIEW_MAX_BYTES } from '#shared/schemas/upload'
import { routePattern } from './routePattern'

/**
 * Largest body of an ordinary JSON form (issue 13 item 6): the longest of them, a shift-log note
 * of 4000 characters, is at most 24 KB of JSON even with every character escaped.
 */
export const DEFAULT_BODY_BYTES = 64 * 1024

/** Routes that document a larger body; every other /api route gets DEFAULT_BODY_BYTES. */
const NAMED_BODY_LIMITS = [
  { method: 'POST', route: '/api/ingest', bytes: MAX_INGEST_BYTES },
  { method: 'POST', route: '/api/uploads/preview', bytes: PREVIEW_MAX_BYTES },
  { method: 'POST', route: '/api/uploads/import', bytes: MAX_UPLOAD_BYTES },
  { method: 'POST', route: '/api/uploads/rejections', bytes: MAX_UPLOAD_BYTES },
  { method: 'POST', route: '/api/replays/upload', bytes: MAX_REPLAY_FILE_BYTES },
  { method: 'PATCH', route: '/api/incidents/:id', bytes: INCIDENT_FINDINGS_MAX_BYTES },
  { method: 'PUT', route: '/api/admin/opcua/:id/mappings', bytes: OPCUA_MAPPINGS_MAX_BYTES },
].map(limit => ({ ...limit, pattern: routePattern(limit.route) }))

export const namedBodyLimits = (): readonly { method: string, route: string, bytes: number }[] => NAMED_BODY_LIMITS

/** The byte limit of a request's body, by its method and path (without the query). */
export function bodyLimitFor(method: string, path: string): number {
  return NAMED_BODY_LIMITS.find(l => l.method === method && l.pattern.test(path))?.bytes ?? DEFAULT_BODY_BYTES
}

/** 65536 → "64 KiB (65536 bytes)", for messages that name a limit. */
export function describeBytes(bytes: number): string {
  const units = [['GiB', 2 ** 30], ['MiB', 2 ** 20], ['KiB', 2 ** 10]] as const
  const [unit, size] = units.find(([, size]) => bytes >= size) ?? ['bytes', 1]
  if (size === 1) return `${bytes} bytes`
  const amount = Number((bytes / size).toFixed(1))
  return `${amount} ${unit} (${bytes} bytes)`
}
