import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
export default defineEventHandler(async (event) => {
  await requireCapability(event, 'configure')
  return { replays: await listReplays(useDb()), advisory: ADVISORY_CAUTION }
})
