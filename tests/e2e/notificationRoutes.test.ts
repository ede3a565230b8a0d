import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../shared/alarms/vocabulary'
import { localClock } from '../../shared/notifications/routeMatch'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV, startTestMailbox } from '../support/mailbox'
import { createTestTag, ingestAll, mailboxMessages, runServerTask, tick, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

const { mailbox, smtpUrl } = await startTestMailbox()
await setupBuiltServer({ ...MANUAL_TICKS_ENV, NUXT_SMTP_URL: smtpUrl })
const sql = testSql()
let mailboxOpen = true
afterAll(async () => { await sql.end(); if (mailboxOpen) await mailbox.close() })

let admin = ''
let siteId = 0
let timeZone = 'UTC'
beforeAll(async () => {
  await waitForDemoSite(sql)
  admin = await signInAs('admin')
  ;[{ id: siteId, time_zone: timeZone }] = await sql`select id, time_zone from sites limit 1` as unknown as [{ id: number, time_zone: string }]
})

const route = (fields: Record<string, unknown>) => call('/api/admin/routes', { method: 'POST', cookie: admin, json: { siteId, minPriority: 'high', alarmClasses: ['alarm'], ...fields } })

describe('notification routes', () => {
  it('sends a test e-mail through the outbox to SMTP and lists it in the route\'s delivery log', async () => {
    const created = await route({ name: 'Day shift lead', email: 'dayshift@harrowgate.example' })
    expect(created.status).toBe(201)
    const queued = await call(`/api/admin/routes/${created.body.id}/test`, { method: 'POST', cookie: admin })
    expect(queued.status).toBe(202)
    expect(queued.body.recipients).toEqual(['dayshift@harrowgate.example'])
    await runServerTask('notifications:send')
    const mail = (await mailboxMessages(mailbox.httpPort)).find(m => m.to.includes('dayshift@harrowgate.example'))
    expect(mail?.subject).toBe('Brinkline: test message for route "Day shift lead"')
    expect(mail!.text).toContain(ADVISORY_CAUTION)
    const log = await call(`/api/admin/routes/${created.body.id}/deliveries`, { cookie: admin })
    expect(log.body).toHaveLength(1)
    expect(log.body[0]).toMatchObject({ kind: 'test', status: 'sent', attempts: 1, failedAttempts: 0 })
    const [audit] = await sql`select detail from audit_log where action = 'route.create' and (detail->>'id')::int = ${created.body.id}`
    expect(audit!.detail.before).toBeNull()
    expect(audit!.detail.after.email).toBe('dayshift@harrowgate.example')
  })

  it('names the field of a bad route and stores nothing', async () => {
    const before = (await sql`select count(*)::int as n from notification_routes`)[0]!.n
    const both = await route({ name: 'Both', email: 'x@harrowgate.example', role: 'engineer' })
    expect(both.status).toBe(400)
    expect(both.body.message).toContain('email: give either an e-mail address or a role')
    const unit = await route({ name: 'Unit elsewhere', email: 'x@harrowgate.example', unitId: 999_999 })
    expect(unit.status).toBe(400)
    expect(unit.body.message).toContain('unitId:')
    const classes = await route({ name: 'No classes', email: 'x@harrowgate.example', alarmClasses: [] })
    expect(classes.body.message).toContain('alarmClasses:')
    const hours = await route({ name: 'Empty window', email: 'x@harrowgate.example', hours: 'working', workStartMinute: 600, workEndMinute: 600 })
    expect(hours.body.message).toContain('workEndMinute:')
    expect((await sql`select count(*)::int as n from notification_routes`)[0]!.n).toBe(before)
    expect((await call('/api/admin/routes', { cookie: await signInAs('engineer') })).status).toBe(403)
  })

  it('chooses recipients by class, unit, hours and digest preference when an alarm is raised', async () => {
    const tagId = await createTestTag(sql, 'TT-961', 'D-200', 1)
    const [{ unit_id: unitId }] = await sql`select unit_id from tags where id = ${tagId}` as unknown as [{ unit_id: number }]
    const [{ id: otherUnit }] = await sql`select id from units where site_id = ${siteId} and id <> ${unitId} limit 1` as unknown as [{ id: number }]
    // A one-minute working window twelve hours from now, in the site's zone: certainly closed now.
    const closedStart = (localClock(new Date(), timeZone).minute + 720) % 1440
    const made = await Promise.all([
      route({ name: 'Alarms only', email: 'alarms@harrowgate.example' }),
      route({ name: 'Alerts', email: 'alerts@harrowgate.example', alarmClasses: ['alert'] }),
      route({ name: 'Other unit', email: 'other@harrowgate.example', alarmClasses: ['alert'], unitId: otherUnit }),
      route({ name: 'Closed now', email: 'closed@harrowgate.example', alarmClasses: ['alert'], hours: 'working', workStartMinute: closedStart, workEndMinute: (closedStart + 1) % 1440, workDays: [1, 2, 3, 4, 5, 6, 7] }),
      route({ name: 'Digest reader', email: 'digest@harrowgate.example', alarmClasses: ['alert'], delivery: 'digest' }),
      route({ name: 'Urgent only', email: 'urgent@harrowgate.example', alarmClasses: ['alert'], minPriority: 'urgent' }),
    ])
    for (const m of made) expect(m.status).toBe(201)
    const engineer = await signInAs('engineer')
    const rule = await call('/api/rules', { method: 'POST', cookie: engineer, json: {
      targetKind: 'tag', tagId, name: 'TT-961 advisory high', measure: 'value', comparison: 'above', threshold: 100,
      priority: 'high', alarmClass: 'alert', consequence: 'Test consequence.', likelyCause: 'Test cause.', operatorAction: 'Test action.', timeToRespondS: 600,
    } })
    expect(rule.status).toBe(201)
    await ingestAll([90, 200].map((value, i) => ({ tag: 'TT-961', time: new Date(Date.now() - 30_000 + i * 1000).toISOString(), value })))
    await tick()
    const [alarm] = await sql`select id from alarms where rule_id = ${rule.body.id}`
    expect(alarm).toBeDefined()
    const single = await sql`select recipients, route_ids from notification_outbox where kind = 'alarm' and alarm_id = ${alarm!.id}`
    expect(single).toHaveLength(1)
    // The demo on-call route (high and up, alarms and alerts) and the "Alerts" route.
    expect(single[0]!.recipients).toEqual(['alerts@harrowgate.example', 'oncall@harrowgate.example'])
    expect(single[0]!.route_ids).toContain(made[1]!.body.id)
    const digest = await sql`select recipients, route_ids from notification_outbox where kind = 'digest' and ${alarm!.id}::bigint = any(alarm_ids)`
    expect(digest).toHaveLength(1)
    expect(digest[0]!.recipients).toEqual(['digest@harrowgate.example'])
    expect(digest[0]!.route_ids).toEqual([made[4]!.body.id])
  })

  it('shows a message the relay did not take as retrying in the delivery log, with the error', async () => {
    const created = await route({ name: 'Relay down', email: 'down@harrowgate.example' })
    await mailbox.close()
    mailboxOpen = false
    await call(`/api/admin/routes/${created.body.id}/test`, { method: 'POST', cookie: admin })
    await runServerTask('notifications:send')
    const log = await call(`/api/admin/routes/${created.body.id}/deliveries`, { cookie: admin })
    expect(log.body[0]).toMatchObject({ kind: 'test', status: 'pending', attempts: 1, failedAttempts: 1 })
    expect(log.body[0].lastError).toBeTruthy()
  })
})
