// Human-readable times and numbers for messages: UTC is stored, plant-local time is shown
// beside it (docs/design.md §D9).
import { plainNumber } from '../utils/numberText'

/** "2026-01-05 09:00:00 Europe/London (08:00:00 UTC)". */
export function plantTime(iso: string | Date, timeZone: string): string {
  const date = new Date(iso)
  const local = new Intl.DateTimeFormat('en-CA', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23',
  }).format(date).replace(',', '')
  return `${local} ${timeZone} (${date.toISOString().slice(11, 19)} UTC)`
}

/**
 * Four significant figures in plain notation at every magnitude: mails read as the screens do
 * (shared/utils/numberText.ts owns the rule; "0.00012", never "1.200e-4").
 */
export function number(value: number | null | undefined): string {
  return plainNumber(value, 4)
}
