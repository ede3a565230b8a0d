import type postgres from 'postgres'
import { call } from './session'

/**
 * Runs one task now through the test-only route (the server needs BRINKLINE_TEST_ROUTES=1), on
 * the file's server or on another instance given by its base address.
 */
export async function runServerTask(task: 'indicators:refresh' | 'notifications:send' | 'replays:sweep' | 'storage:maintain', base = '') {
  const res = await call(`${base}/api/public/test/run-task`, { method: 'POST', json: { task } })
  if (res.status !== 200) throw new Error(`${task} answered ${res.status}: ${JSON.stringify(res.body)}`)
  return res.body.result
}

/** One tick as the scheduler runs it: the pipeline, then the sender. */
export async function tick() {
  const pipeline = await runServerTask('indicators:refresh')
  const sender = await runServerTask('notifications:send')
  return { pipeline, sender }
}

/** A tag of its own for one test, on a demo unit, so no other test's samples mix in. */
export async function createTestTag(sql: postgres.Sql, code: string, unitCode: string, samplePeriodS: number): Promise<number> {
  const [row] = await sql`
    insert into tags (site_id, unit_id, code, description, engineering_unit, sample_period_s, range_low, range_high)
    select u.site_id, u.id, ${code}, ${`Test signal ${code}`}, 'K', ${samplePeriodS}, 0, 1000 from units u where u.code = ${unitCode}
    returning id`
  return row!.id as number
}

/** Posts samples through the ingest API with the demo simulators' gateway key, in batches. */
export async function ingestAll(samples: { tag: string, time: string, value: number }[], batch = 5000) {
  const key = process.env.BRINKLINE_SIM_KEY
  if (!key) throw new Error('BRINKLINE_SIM_KEY is not set: run the suite through `npm test`')
  for (let i = 0; i < samples.length; i += batch) {
    const res = await call('/api/ingest', { method: 'POST', headers: { authorization: `Bearer ${key}` }, json: { samples: samples.slice(i, i + batch) } })
    if (res.status !== 200 || res.body.rejected.length > 0) throw new Error(`ingest answered ${res.status}: ${JSON.stringify(res.body).slice(0, 300)}`)
  }
}

/** Messages the local mailbox has received, newest last. */
export async function mailboxMessages(httpPort: number): Promise<{ to: string[], subject: string, text: string, receivedAt: string }[]> {
  const res = await fetch(`http://127.0.0.1:${httpPort}/api/messages`)
  const body = await res.json() as unknown
  type Message = { to: string[], subject: string, text: string, receivedAt: string }
  const list = (Array.isArray(body) ? body : (body as { messages: unknown[] }).messages) as Message[]
  return [...list].sort((a, b) => a.receivedAt.localeCompare(b.receivedAt))
}

/** Waits until the server has migrated and seeded the demo site (both run at start-up). */
export async function waitForDemoSite(sql: postgres.Sql, timeoutMs = 60_000) {
  const until = Date.now() + timeoutMs
  await call('/api/public/health')
  while (Date.now() < until) {
    const [row] = await sql`select count(*)::int as n from alarm_rules`.catch(() => [{ n: 0 }])
    if (row!.n > 0) return
    await new Promise(resolve => setTimeout(resolve, 250))
  }
  throw new Error('the demo site was not seeded in time')
}
