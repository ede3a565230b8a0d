import type { IndicatorSettings } from './indicatorDefaults'

/**
 * One settings version of a tag and the samples it governed: those after `afterS` (epoch seconds;
 * null for the first, which reaches back to the tag's first sample).
 */
export interface SettingsInForce { afterS: number | null, versionId: number, settings: IndicatorSettings }

/** A settings version with the time of the last indicator point it produced (null: none). */
export interface VersionUse { id: number, settings: IndicatorSettings, lastPointS: number | null }

/**
 * A tag's settings versions (oldest first) as the spans of samples they governed. The live task
 * reads the settings at each tick, so a version governs the samples processed after it was saved —
 * for back-filled history not the samples *timed* after it. Every indicator point names the version
 * that produced it, so a version's span starts after the last point of the one before; a version
 * that produced no point passes its start on. This is what makes a replay of processed history give
 * the live evaluations at the same times (tests/e2e/replay.test.ts).
 */
export function settingsSchedule(versions: readonly VersionUse[]): SettingsInForce[] {
  let afterS: number | null = null
  return versions.map((v, i) => {
    if (i > 0) afterS = versions[i - 1]!.lastPointS ?? afterS
    return { afterS, versionId: v.id, settings: v.settings }
  })
}

/** The index of the entry governing a sample at `timeS`: the last one whose span began before it. */
export function entryAt(schedule: readonly SettingsInForce[], timeS: number): number {
  let at = 0
  for (let i = 1; i < schedule.length; i++) if (schedule[i]!.afterS! < timeS) at = i
  return at
}
