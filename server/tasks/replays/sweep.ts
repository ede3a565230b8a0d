// Marks failed the replays whose queue job pg-boss has given up (retries spent, cancelled, gone),
// so none stays "queued" or "running" for ever. Any instance may run it: the update is guarded
// by the replay's state, so two sweeps at once fail a replay once.
export default defineTask<string>({
  meta: { name: 'replays:sweep', description: 'Replays whose job the queue gave up → failed' },
  async run({ payload }) {
    return scheduledWork('replays:sweep', payload,
      async () => `${await failGivenUpReplays(useDb(), replayJobGivenUp)} replay(s) marked failed`)
  },
})
