import type { UnitCode } from '../../shared/demo/catalogue'
import { createCstrUnit } from './cstrUnit'
import { createDigesterUnit } from './digesterUnit'
import { createGridUnit } from './gridUnit'
import type { SimulatedUnit, UnitOptions } from './simulatedUnit'
import { createSteadyUnit } from './steadyUnit'

const FACTORIES: Record<UnitCode, (options: UnitOptions) => SimulatedUnit> = {
  cstr: createCstrUnit,
  digester: createDigesterUnit,
  grid: createGridUnit,
  steady: createSteadyUnit,
}

export function createUnit(code: UnitCode, options: UnitOptions): SimulatedUnit {
  return FACTORIES[code](options)
}
