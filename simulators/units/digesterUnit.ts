// D-200: the anaerobic digester of docs/science.md §S10.3 (AM2, 2-state reduction). Feed flow creeps up,
// so the dilution rate D rises toward D_c, where methanogens can no longer outgrow washout: VFA
// accumulate, pH falls, biogas dries up.
import {
  digesterDerivative, digesterFoldDilution, digesterWorkingPoint, methaneProductionRate,
} from '../models/digester'
import { createDriftingUnit, type UnitOptions } from './simulatedUnit'

// Effective VFA load the acidogens hand on: the value docs/science.md §S10.3 lists eigenvalues for.
const S2_EFFECTIVE = 100
// Invented plant size and gas make-up.
const REACTOR_VOLUME_LITRES = 500_000
const METHANE_FRACTION = 0.65
const MOLAR_GAS_VOLUME_M3 = 0.0224 // m³/mol at 0 °C, 1 atm
// pH from the bicarbonate buffer: AM2 takes bicarbonate as alkalinity Z minus VFA, and dissolved
// CO₂ from Henry's law. Z, the CO₂ partial pressure and pK are plausible values for a digester
// [from memory], chosen so pH sits near 7.4 at work and sours toward 6.4 when VFA pile up.
const ALKALINITY_Z = 110 // mmol/L
const DISSOLVED_CO2 = 16 * 0.35 // K_H (mmol/(L·atm), docs/science.md §S10.3) × P_CO2 0.35 atm
const PK_CARBONIC = 6.19 // −log10(6.5e-7 mol/L)

// One wall second is 8 process hours: at the start the digester relaxes in ~4 days ≈ 13 wall
// seconds. The approach is far slower than a real one (docs/science.md §S10.3: 30–100 d) so that it spans
// enough relaxation times for the slowing down to show at demo pace.
const DAYS_PER_WALL_SECOND = 1 / 3
const WALL_MINUTES_TO_FOLD = 45
const WALL_MINUTES_TIPPED = 5
// Slowing down only shows within ~5–7% of D_c (docs/science.md §S10.3), so the demo starts close to it.
const START_DILUTION = 0.98 // d⁻¹
// Well above the working branch (S2* ≤ 48.7 mmol/L) and its saddle at the fold: soured.
const SOURED_VFA = 80

/** pH of the liquor for a VFA level (bicarbonate/CO₂ buffer; see constants above). */
export function digesterPh(vfa: number): number {
  const bicarbonate = Math.max(1, ALKALINITY_Z - vfa)
  return PK_CARBONIC + Math.log10(bicarbonate / DISSOLVED_CO2)
}

/** Biogas flow, m³/h, from the methane production rate of the whole reactor. */
export function biogasFlow(state: readonly number[]): number {
  const methaneMolPerDay = methaneProductionRate(state) * REACTOR_VOLUME_LITRES / 1000
  return Math.max(0, methaneMolPerDay * MOLAR_GAS_VOLUME_M3 / 24 / METHANE_FRACTION)
}

export function createDigesterUnit(options: UnitOptions) {
  const paramsAt = (D: number) => ({ D, S2eff: S2_EFFECTIVE })
  const toDays = (minutes: number) => minutes * 60 * DAYS_PER_WALL_SECOND
  return createDriftingUnit({
    code: 'digester',
    modelTimePerWallSecond: DAYS_PER_WALL_SECOND,
    maxStep: 0.01,
    // Feed-strength fluctuations act mostly on the VFA balance; biomass noise is small.
    noiseSd: [0.003, 2.5],
    cycle: {
      start: START_DILUTION,
      fold: digesterFoldDilution().D,
      timeToFold: toDays(WALL_MINUTES_TO_FOLD),
      holdAfterTip: toDays(WALL_MINUTES_TIPPED),
    },
    derivative: D => {
      const f = digesterDerivative(paramsAt(D))
      // Biomass cannot go negative; noise must not push it there.
      return state => f([Math.max(0, state[0]!), state[1]!])
    },
    restingState: D => digesterWorkingPoint(paramsAt(D)),
    hasTipped: ([, S2]) => S2! > SOURED_VFA,
    integrateWhileTipped: true,
    trueValues: ([X2, S2]) => ({
      'AI-201': S2!,
      'AI-202': digesterPh(S2!),
      'FI-203': biogasFlow([Math.max(0, X2!), S2!]),
    }),
    describe: ([, S2], D, phase) =>
      `dilution ${D.toFixed(4)} d⁻¹ (washout fold at ${digesterFoldDilution().D.toFixed(4)}), `
      + `VFA ${S2!.toFixed(1)} mmol/L${phase === 'tipped' ? ', SOURED' : ''}`,
  }, options)
}
