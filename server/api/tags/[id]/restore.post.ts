import { plantRetirementRoute } from '../../../services/plantModel/retirementRoute'

export default plantRetirementRoute('tag', false)
