import { sql } from 'drizzle-orm'

// For load balancers and the start script: 200 when the server and its database answer.
export default defineEventHandler(async () => {
  await useDb().execute(sql`select 1`)
  return { status: 'ok', time: new Date().toISOString() }
})
