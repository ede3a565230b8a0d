import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
import { replayCreateSchema } from '#shared/schemas/replay'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const input = await validBody(event, replayCreateSchema)
  const replay = await useDb().transaction(async (tx) => {
    const created = await createReplay(tx, input, user.id).catch((err) => {
      if (err instanceof ReplayTagMissing || err instanceof ReplayFileMissing) throw createError({ statusCode: 400, message: err.message })
      throw err
    })
    await recordReplayJob(tx, created.id, await enqueueReplay(tx, created.id))
    await writeAudit(tx, {
      userId: user.id, action: 'replay.create', target: `replay ${created.id}`,
      detail: { id: created.id, ...input, alternativeSettings: created.alternativeSettings }, address: clientAddress(event),
    })
    return created
  })
  setResponseStatus(event, 201)
  return { id: replay.id, state: replay.state, advisory: ADVISORY_CAUTION }
})
