import { readPlantModel } from '../../services/plantModel/list'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'configure')
  return readPlantModel(useDb())
})
