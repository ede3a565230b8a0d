import { alarmRulePreviewSchema } from '#shared/schemas/alarmRule'
import { previewRule } from '../../services/rulePreview/preview'

// A POST because the draft travels as a JSON body; nothing is stored.
export default defineEventHandler(async (event) => {
  await requireCapability(event, 'configure')
  const { rule, ruleId } = await validBody(event, alarmRulePreviewSchema)
  const preview = await previewRule(useDb(), rule, ruleId)
  if (!preview) throw createError({ statusCode: 400, message: rule.targetKind === 'tag' ? `rule.tagId: tag ${rule.tagId} does not exist` : `rule.unitId: unit ${rule.unitId} does not exist` })
  return preview
})
