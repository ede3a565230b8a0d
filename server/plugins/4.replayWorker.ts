import { ensureMigrated } from './0.migrate'
import { runReplay } from '../services/replay/replayRun'
import { startReplayWorker, stopReplayQueue } from '../services/replay/replayQueue'

/** While the database is down at start-up, try the queue again this often. */
const RETRY_MS = 10_000

// Every server instance works replay jobs, one at a time, unless BRINKLINE_REPLAY_WORKER=0
// (server/utils/backgroundWorkers.ts): such an instance still queues replays for the others.
export default defineNitroPlugin((nitroApp) => {
  if (!backgroundWorkerOn('BRINKLINE_REPLAY_WORKER')) {
    console.log('[replay] worker off (BRINKLINE_REPLAY_WORKER=0)')
    return
  }
  let stopped = false
  let timer: ReturnType<typeof setTimeout> | undefined
  const start = () => {
    ensureMigrated().then(() => startReplayWorker(id => runReplay(useDb(), id))).then(
      () => console.log('[replay] worker started'),
      (err: Error) => {
        console.error(`[replay] worker not started (${err.message}); retrying in ${RETRY_MS / 1000} s`)
        if (!stopped) timer = setTimeout(start, RETRY_MS)
      },
    )
  }
  start()
  nitroApp.hooks.hook('close', async () => {
    stopped = true
    clearTimeout(timer)
    await stopReplayQueue()
  })
})
