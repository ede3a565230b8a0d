import { describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../../../shared/alarms/vocabulary'
import { renderAlarmMail, renderDigestMail, type AlarmMailFacts } from '../../../../shared/notifications/alarmMail'
import { plantTime } from '../../../../shared/notifications/format'

// Invented facts: what is checked is that each required element reaches the text (docs/design.md §D4
// item 6 lists them; §D1 gives the caution), not any value of the demo plant.
const FACTS: AlarmMailFacts = {
  alarmId: 42, priority: 'high', alarmClass: 'alarm', siteName: 'Test Works', timeZone: 'Europe/London',
  unitCode: 'U-1', unitName: 'Test unit', tagCode: 'TI-1', tagDescription: 'Test temperature', engineeringUnit: 'K',
  ruleName: 'TI-1 fold in view', measureLabel: 'fold horizon (s)', comparison: 'below', threshold: 1200, value: 900,
  raisedAt: '2026-07-01T08:00:00.000Z', activatedAt: '2026-07-01T08:00:00.000Z', activationCount: 1, latestValue: 880, standing: true,
  trend: { tauAr1: 0.81, pAr1: 0.01, tauVariance: 0.4, pVariance: 0.03, evidence: 'slowing down' },
  fold: { kind: 'projected', seconds: 900, lowSeconds: 600, highSeconds: 1500 },
  consequence: 'Runaway.', likelyCause: 'Cooling lost.', operatorAction: 'Open the cooling valve.', link: 'http://x.test/alarms?id=42',
}

describe('alarm mail text', () => {
  it('writes numbers as the screens do: no exponent for tiny values, p below 0.001 as "< 0.001"', () => {
    const { subject, text } = renderAlarmMail({
      ...FACTS, measureLabel: 'variance', threshold: 0.00012, value: 0.000153, latestValue: 0.0000871,
      trend: { ...FACTS.trend!, pAr1: 0.000028, tauAr1: -0.0004 },
    })
    expect(subject).toContain('variance below 0.00012')
    expect(text).toContain('at 0.000153')
    expect(text).toContain('Latest:    0.0000871')
    expect(text).toContain('Kendall tau -0.0004; stability test p < 0.001')
    expect(`${subject}\n${text}`).not.toMatch(/\de[-+]\d/)
  })

  it('states priority, target, condition, trend, fold band, operator action, link and the advisory caution', () => {
    const { subject, text } = renderAlarmMail(FACTS)
    expect(subject).toContain('HIGH alarm')
    expect(subject).toContain('TI-1 (U-1)')
    expect(text).toContain('Condition: fold horizon (s) below 1200')
    expect(text).toContain('Kendall tau 0.81; stability test p 0.01')
    expect(text).toContain('Early-warning decision: slowing down, because')
    expect(text).toContain('Raised:    2026-07-01 09:00:00 Europe/London (08:00:00 UTC) at 900')
    expect(text).toContain('Fold horizon: projected in 15 min (band 10 min to 25 min).')
    expect(text).toContain('Operator action: Open the cooling valve.')
    expect(text).toContain('Open the alarm: http://x.test/alarms?id=42')
    expect(text.trim().endsWith(ADVISORY_CAUTION)).toBe(true)
  })

  it('says so when no fold is in view and when a unit rule has no tag', () => {
    const { subject, text } = renderAlarmMail({ ...FACTS, tagCode: null, tagDescription: null, engineeringUnit: null, fold: { kind: 'none' }, trend: null })
    expect(subject).toContain('unit U-1')
    expect(text).toContain('no fold in view')
    expect(text).toContain('Trend: not evaluated yet')
  })

  it('writes a re-activation from its own facts: the latest time and value, which activation it is, and when the occurrence began', () => {
    const { text } = renderAlarmMail({ ...FACTS, activatedAt: '2026-07-01T11:30:00.000Z', activationCount: 3, value: 640 })
    expect(text).toContain('Raised again: 2026-07-01 12:30:00 Europe/London (11:30:00 UTC) at 640')
    expect(text).toContain('activation 3 of this occurrence, first raised 2026-07-01 09:00:00 Europe/London')
    expect(text).not.toMatch(/Raised: +2026-07-01 09:00/)
  })

  it('says why the early-warning decision is what it is (a p above the per-look level is not a trend)', () => {
    const { text } = renderAlarmMail({ ...FACTS, trend: { ...FACTS.trend!, pVariance: 0.04, evidence: 'no trend' } })
    expect(text).toContain('change p 0.04')
    expect(text).toMatch(/Early-warning decision: no trend, because neither p is at or below the per-look significance level/)
  })

  it('calls an alert advisory', () => {
    expect(renderAlarmMail({ ...FACTS, alarmClass: 'alert', priority: 'medium' }).subject).toContain('MEDIUM advisory alert')
  })

  it('lists a flood digest most urgent first, each with its action and link, and the caution once', () => {
    const digest = renderDigestMail({ siteName: 'Test Works', listLink: 'http://x.test/alarms', alarms: [
      { ...FACTS, alarmId: 2, priority: 'low', link: 'http://x.test/alarms?id=2' },
      { ...FACTS, alarmId: 1, priority: 'urgent', link: 'http://x.test/alarms?id=1' },
    ] })
    expect(digest.subject).toContain('2 alarms')
    expect(digest.text.indexOf('URGENT')).toBeLessThan(digest.text.indexOf('LOW'))
    expect(digest.text).toContain('http://x.test/alarms?id=2')
    expect(digest.text.split(ADVISORY_CAUTION)).toHaveLength(2)
  })
})

describe('message formats', () => {
  it('shows plant-local time beside UTC (docs/design.md §D9); Europe/London is UTC+1 in July [common practice]', () => {
    expect(plantTime('2026-07-01T08:00:00.000Z', 'Europe/London')).toBe('2026-07-01 09:00:00 Europe/London (08:00:00 UTC)')
  })
})
