import { describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../../../shared/alarms/vocabulary'
import { isFromOldHistory } from '../../../../shared/alarms/historyNotice'
import type { AlarmMailFacts } from '../../../../shared/notifications/alarmMail'
import { historyNoticeComment, renderHistorySummaryMail } from '../../../../shared/notifications/historySummaryMail'

// Invented facts: what is checked is the product rule of docs/design.md §D4 item 5 (one summary,
// standing alarms first, each alarm once, the caution of §D1), not any demo value.
const BASE: AlarmMailFacts = {
  alarmId: 1, priority: 'high', alarmClass: 'alarm', siteName: 'Test Works', timeZone: 'UTC',
  unitCode: 'U-1', unitName: 'Test unit', tagCode: 'TI-1', tagDescription: 'Test temperature', engineeringUnit: 'K',
  ruleName: 'TI-1 high', measureLabel: 'value', comparison: 'above', threshold: 100, value: 104,
  raisedAt: '2026-07-01T06:00:00.000Z', activatedAt: '2026-07-01T06:00:00.000Z', activationCount: 1, latestValue: 103, standing: true,
  trend: null, fold: { kind: 'none' }, consequence: 'c', likelyCause: 'l', operatorAction: 'Open the test valve.', link: 'http://x.test/alarms/1',
}

describe('alarms raised from old history', () => {
  it('counts an activation as old history only when it is older than the configured age', () => {
    const now = Date.UTC(2026, 6, 1, 9)
    expect(isFromOldHistory(now - 31 * 60_000, now, 30)).toBe(true)
    expect(isFromOldHistory(now - 29 * 60_000, now, 30)).toBe(false)
    expect(isFromOldHistory(now - 2 * 3_600_000, now, 180)).toBe(false)
  })

  it('sends one summary: the alarms still standing first with their action, those back to normal after, each once', () => {
    const { subject, text } = renderHistorySummaryMail({
      siteName: 'Test Works', activations: 7, maxAgeMinutes: 30, listLink: 'http://x.test/alarms',
      alarms: [
        { ...BASE, alarmId: 2, priority: 'low', standing: false, link: 'http://x.test/alarms/2' },
        { ...BASE, alarmId: 1, priority: 'urgent', activationCount: 6, activatedAt: '2026-07-01T08:10:00.000Z' },
      ],
    })
    expect(subject).toBe('[Brinkline history summary] Test Works: 2 alarms from old history, 1 still standing')
    expect(text).toContain('recorded 7 alarm activations at Test Works from samples more than 30 min old')
    expect(text.indexOf('Still standing now (1)')).toBeLessThan(text.indexOf('Back to normal since (1)'))
    expect(text).toContain('Operator action: Open the test valve.')
    expect(text).toContain('activation 6 of this occurrence')
    expect(text.match(/alarms\/1\b/g)).toHaveLength(1)
    expect(text.trim().endsWith(ADVISORY_CAUTION)).toBe(true)
  })

  it('tells the alarm trail why no mail went out', () => {
    expect(historyNoticeComment(7_500)).toContain('2 h 05 min older than its recording')
  })
})
