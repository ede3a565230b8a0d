// Alarm flood (docs/science.md §S7.4): more than 10 alarms in 10 minutes for one operator position
// (ISA-18.2 / EEMUA 191 [R: University of Alberta alarm-research page]). Brinkline applies it per
// site to mail: past the threshold, alarms are gathered into one digest instead of a mail each.
export const FLOOD_WINDOW_MINUTES = 10
export const FLOOD_THRESHOLD = 10

/** `annunciations` counts those on the site in the trailing window, the new one included. */
export const inFlood = (annunciations: number): boolean => annunciations > FLOOD_THRESHOLD

/** How long a digest collects alarms before it is sent. */
export const DIGEST_COLLECT_SECONDS = 60
