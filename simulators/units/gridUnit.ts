// B-300: a load bus at the end of a long line (docs/science.md §S10.2 two-bus model with load
// restoration). Demand grows toward the nose of the P–V curve; past it the restoring loads pull
// the voltage down until undervoltage protection sheds them.
import {
  deliveredPower, loadBusVoltage, pvNose, stableAdmittance, twoBusDerivative, type TwoBusParameters,
} from '../models/grid'
import { createDriftingUnit, type UnitOptions } from './simulatedUnit'

// docs/science.md §S10.2 reference network with a lagging load at power factor 0.98 (tanφ = 0.2).
const NETWORK: TwoBusParameters = { E: 1, X: 0.5, tanPhi: 0.2, Tp: 60 }
const BASE_MW = 100
// Ambient load fluctuation: OU with 5 s correlation and 1% of demand (docs/science.md §S10.2: 0.5–2%, 1–10 s).
const LOAD_NOISE_CORRELATION_S = 5
const LOAD_NOISE_SD = 0.01
// Four process seconds per wall second: far from the nose loads restore in ~80 s ≈ 20 wall seconds.
const PROCESS_SECONDS_PER_WALL_SECOND = 4
const WALL_MINUTES_TO_FOLD = 35
const WALL_MINUTES_TIPPED = 3
const START_DEMAND = 0.45 // pu
// Undervoltage load-shedding threshold [common practice: relays set well below 0.9 pu].
const COLLAPSE_VOLTAGE = 0.5

export function createGridUnit(options: UnitOptions) {
  const nose = pvNose(NETWORK)
  const toProcessSeconds = (minutes: number) => minutes * 60 * PROCESS_SECONDS_PER_WALL_SECOND
  return createDriftingUnit({
    code: 'grid',
    modelTimePerWallSecond: PROCESS_SECONDS_PER_WALL_SECOND,
    maxStep: 0.5,
    noiseSd: [0, LOAD_NOISE_SD * Math.sqrt(2 / LOAD_NOISE_CORRELATION_S)],
    cycle: {
      start: START_DEMAND,
      fold: nose.Pmax,
      timeToFold: toProcessSeconds(WALL_MINUTES_TO_FOLD),
      holdAfterTip: toProcessSeconds(WALL_MINUTES_TIPPED),
    },
    derivative: demand => twoBusDerivative(NETWORK, demand, LOAD_NOISE_CORRELATION_S),
    restingState: demand => [stableAdmittance(demand, NETWORK), 0],
    hasTipped: ([G]) => loadBusVoltage(G!, NETWORK) < COLLAPSE_VOLTAGE,
    // Once shed, the bus is unloaded: full source voltage and no power until the load is restored.
    integrateWhileTipped: false,
    trueValues: ([G], phase) => phase === 'tipped'
      ? { 'EI-301': NETWORK.E, 'JI-302': 0 }
      : { 'EI-301': loadBusVoltage(G!, NETWORK), 'JI-302': deliveredPower(G!, NETWORK) * BASE_MW },
    describe: ([G], demand, phase) =>
      `demand ${(demand * BASE_MW).toFixed(1)} MW (nose at ${(nose.Pmax * BASE_MW).toFixed(1)} MW), `
      + (phase === 'tipped' ? 'COLLAPSED, load shed' : `voltage ${loadBusVoltage(G!, NETWORK).toFixed(4)} pu`),
  }, options)
}
