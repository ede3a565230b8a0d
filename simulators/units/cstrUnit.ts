// the exothermic reactor of docs/science.md §S10.1 (URP benchmark) on its cool branch. The
// cooling-water supply warms slowly (a tower losing capacity in summer, say) until the cool
// state disappears at the ignition fold and the reactor runs away to its hot state.
import {
  URP_BENCHMARK, concentrationFromX1, cstrDerivative, cstrIgnitionFold, cstrLowerEquilibrium,
  temperatureFromX2, type CstrPlantScale,
} from '../models/cstr'
import { createDriftingUnit, type UnitOptions } from './simulatedUnit'

// Invented plant: feed at 350 K and 1 mol/L, residence time 10 min (docs/science.md §S10.1: θ = 1–30 min).
const SCALE: CstrPlantScale = { feedTemperature: 350, feedConcentration: 1 }
const RESIDENCE_TIME_SECONDS = 600
const { gamma } = URP_BENCHMARK

// One wall second is 2.5 process minutes: far from the fold the reactor relaxes in about
// 2θ ≈ 8 wall seconds (four temperature samples at 2 s), and the approach spans ~600 residence times,
// enough relaxation times for rolling-window indicators to see the slowing down at demo pace.
const RESIDENCE_TIMES_PER_WALL_SECOND = 150 / RESIDENCE_TIME_SECONDS
const WALL_MINUTES_TO_FOLD = 40
const WALL_MINUTES_TIPPED = 5
// Above the saddle and short of the hot state (x2 ≈ 4.7): the reactor has run away.
const RUNAWAY_X2 = 3.5

/** Coolant temperature in K for the dimensionless x2c. */
export const coolantTemperature = (x2c: number) => temperatureFromX2(x2c, gamma, SCALE)

export function createCstrUnit(options: UnitOptions) {
  const fold = cstrIgnitionFold('x2c', URP_BENCHMARK).value
  const paramsAt = (x2c: number) => ({ ...URP_BENCHMARK, x2c })
  const wallSecondsToModel = (minutes: number) => minutes * 60 * RESIDENCE_TIMES_PER_WALL_SECOND
  return createDriftingUnit({
    code: 'cstr',
    modelTimePerWallSecond: RESIDENCE_TIMES_PER_WALL_SECOND,
    maxStep: 0.01,
    // Feed concentration and temperature fluctuations of about 0.5–1% (docs/science.md §S10.1) as additive noise.
    noiseSd: [0.005, 0.02],
    cycle: {
      start: URP_BENCHMARK.x2c,
      fold,
      timeToFold: wallSecondsToModel(WALL_MINUTES_TO_FOLD),
      holdAfterTip: wallSecondsToModel(WALL_MINUTES_TIPPED),
    },
    derivative: x2c => cstrDerivative(paramsAt(x2c)),
    restingState: x2c => cstrLowerEquilibrium(paramsAt(x2c)),
    hasTipped: ([, x2]) => x2! > RUNAWAY_X2,
    integrateWhileTipped: true,
    trueValues: ([x1, x2]) => ({
      'TI-101': temperatureFromX2(x2!, gamma, SCALE),
      'AI-102': concentrationFromX1(x1!, SCALE),
    }),
    describe: ([, x2], x2c, phase) =>
      `coolant ${coolantTemperature(x2c).toFixed(2)} K (ignites at ${coolantTemperature(fold).toFixed(2)} K), `
      + `reactor ${temperatureFromX2(x2!, gamma, SCALE).toFixed(1)} K${phase === 'tipped' ? ', RUNAWAY' : ''}`,
  }, options)
}
