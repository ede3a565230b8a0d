const DAY_MS = 86_400_000

/**
 * Where a site's raw window begins: the start of the UTC day `days` before now. Raw samples go
 * in whole UTC days (one partition each), so a day leaves only once all of it is older than the
 * window, and a site always keeps at least `days` of raw samples. One rule for the storage job,
 * which folds older days into the archive, and for ingest, which refuses samples that old (the
 * archive already holds that time; a re-sent batch would otherwise be counted twice).
 */
export function rawWindowStartMs(nowMs: number, days: number): number {
  return Math.floor((nowMs - days * DAY_MS) / DAY_MS) * DAY_MS
}
