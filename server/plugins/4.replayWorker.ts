import { ensureMigrated } from './0.migrate'
import { runReplay } from '../services/replay/replayRun'
import { startReplayWorker, stopReplayQueue } from '../services/replay/replayQueue'

/** While the database is down at start-up, try the queue again this often. */
const RETRY_MS = 10_000

// Every server instance works replay jobs, one at a time. Under NODE_ENV=test it is off, so test
// files that do not replay never start a queue client; the replay tests switch it on with
// BRINKLINE_REPLAY_WORKER=1. BRINKLINE_REPLAY_WORKER=0 turns it off anywhere (an instance that
// should only answer requests still queues replays for the others).
export default defineNitroPlugin((nitroApp) => {
  const flag = process.env.BRINKLINE_REPLAY_WORKER
  if (flag === '0' || (process.env.NODE_ENV === 'test' && flag !== '1')) return
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
