import { z } from 'zod'

const TASKS = ['indicators:refresh', 'notifications:send', 'replays:sweep', 'storage:maintain'] as const
const runTaskSchema = z.object({ task: z.enum(TASKS, { errorMap: () => ({ message: `must be one of ${TASKS.join(', ')}` }) }) })

// Test-only: runs one task now, so tests drive ticks deterministically. 404 unless the server
// was started with BRINKLINE_TEST_ROUTES=1, so it does not exist in production.
export default defineEventHandler(async (event) => {
  if (process.env.BRINKLINE_TEST_ROUTES !== '1') throw createError({ statusCode: 404, message: 'Not found' })
  const { task } = await validBody(event, runTaskSchema)
  return runTask(task, { payload: { manual: true } })
})
