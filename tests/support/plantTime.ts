import { wallClockText } from '../../shared/utils/timeText'

/** The demo site's clock (server/services/demo/demoSeed.ts), as the forms read times. */
export const DEMO_ZONE = 'Europe/London'

/** A time as typed into a form's plant-time field: "YYYY-MM-DD HH:MM" on the demo site's clock. */
export const typedPlantTime = (ms: number) => wallClockText(new Date(ms), DEMO_ZONE).slice(0, 16)
