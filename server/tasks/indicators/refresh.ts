// The live pipeline's tick (docs/design.md §D4 item 3). Scheduled runs can be switched off per instance with
// NUXT_PIPELINE_SCHEDULED=false (the cron itself is fixed when the server is built).
export default defineTask<TickReport | string>({
  meta: { name: 'indicators:refresh', description: 'New samples → indicators, trend tests, fold horizon, rules, alarms, tag status' },
  async run({ payload }) {
    if (payload.scheduledTime && !useRuntimeConfig().pipeline.scheduled) return { result: 'scheduled runs are switched off' }
    return scheduledWork('indicators:refresh', payload, () => runPipelineTick(useDb(), changeContext(null)))
  },
})
