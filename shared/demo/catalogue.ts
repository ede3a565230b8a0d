// The demo plant: an invented company and site whose units and tags the simulators drive and
// the seed script creates in the database. One source for both, so they cannot drift apart.
// Tag codes follow ISA-5.1 letters [common practice]: T temperature, A analysis, F flow,
// E voltage, J power, L level; I indicate.

export const DEMO_COMPANY = 'Harrowgate Process Co.'
export const DEMO_SITE = 'Fenwick Works'

export type UnitCode = 'cstr' | 'digester' | 'grid' | 'steady'
export type UnitKind = 'exothermic-reactor' | 'anaerobic-digester' | 'load-bus' | 'steady-control'

export interface CatalogueTag {
  code: string
  description: string
  engineeringUnit: string
  /** Interval between stored samples, wall-clock seconds (what the database receives). */
  samplePeriodSeconds: number
  rangeLow: number
  rangeHigh: number
  /** Standard deviation of the transmitter's own noise, engineering units. */
  noiseFloor: number
  /** Smallest step the transmitter reports (quantisation), engineering units. */
  resolution: number
}

export interface CatalogueUnit {
  code: UnitCode
  name: string
  kind: UnitKind
  description: string
  /** Whether the unit drifts toward a fold; the steady unit is the control that must not alarm. */
  drifts: boolean
  tags: CatalogueTag[]
}

export const CATALOGUE: readonly CatalogueUnit[] = [
  {
    code: 'cstr',
    name: 'R-100 Exothermic reactor',
    kind: 'exothermic-reactor',
    description: 'Jacketed stirred-tank reactor on its cool branch; cooling-water temperature creeps up until it ignites.',
    drifts: true,
    tags: [
      // 2 s, not 1 s: the 1,200-sample trend window then spans the 40-minute approach, so the slowing
      // down shows before the runaway in 6 of 6 seeded cycles (3 of 6 at 1 s; scripts/bench/detection.ts).
      { code: 'TI-101', description: 'Reactor temperature', engineeringUnit: 'K', samplePeriodSeconds: 2, rangeLow: 300, rangeHigh: 500, noiseFloor: 0.1, resolution: 0.01 },
      { code: 'AI-102', description: 'Reactant concentration (analyser)', engineeringUnit: 'mol/L', samplePeriodSeconds: 30, rangeLow: 0, rangeHigh: 1.2, noiseFloor: 0.005, resolution: 0.001 },
    ],
  },
  {
    code: 'digester',
    name: 'D-200 Digester',
    kind: 'anaerobic-digester',
    description: 'High-rate anaerobic digester; feed flow creeps up, shortening retention until the methanogens wash out and VFA accumulate.',
    drifts: true,
    tags: [
      { code: 'AI-201', description: 'Volatile fatty acids (online titrator)', engineeringUnit: 'mmol/L', samplePeriodSeconds: 20, rangeLow: 0, rangeHigh: 200, noiseFloor: 1.5, resolution: 0.1 },
      { code: 'AI-202', description: 'Digester pH', engineeringUnit: 'pH', samplePeriodSeconds: 2, rangeLow: 0, rangeHigh: 14, noiseFloor: 0.003, resolution: 0.001 },
      { code: 'FI-203', description: 'Biogas flow', engineeringUnit: 'm³/h', samplePeriodSeconds: 2, rangeLow: 0, rangeHigh: 300, noiseFloor: 0.5, resolution: 0.1 },
    ],
  },
  {
    code: 'grid',
    name: 'B-300 Load bus',
    kind: 'load-bus',
    description: 'Load bus fed over a long line; demand grows toward the nose of the P–V curve until the voltage collapses.',
    drifts: true,
    tags: [
      { code: 'EI-301', description: 'Load-bus voltage', engineeringUnit: 'pu', samplePeriodSeconds: 2, rangeLow: 0, rangeHigh: 1.2, noiseFloor: 0.0005, resolution: 0.0001 },
      { code: 'JI-302', description: 'Load active power', engineeringUnit: 'MW', samplePeriodSeconds: 2, rangeLow: 0, rangeHigh: 120, noiseFloor: 0.2, resolution: 0.01 },
    ],
  },
  {
    code: 'steady',
    name: 'T-400 Feed tank',
    kind: 'steady-control',
    description: 'Well-tuned feed tank with temperature and level control; nothing drifts, so it must never alarm.',
    drifts: false,
    tags: [
      { code: 'TI-401', description: 'Feed tank temperature', engineeringUnit: '°C', samplePeriodSeconds: 5, rangeLow: 0, rangeHigh: 100, noiseFloor: 0.05, resolution: 0.01 },
      { code: 'LI-402', description: 'Feed tank level', engineeringUnit: '%', samplePeriodSeconds: 5, rangeLow: 0, rangeHigh: 100, noiseFloor: 0.2, resolution: 0.1 },
    ],
  },
]

export function catalogueUnit(code: UnitCode): CatalogueUnit {
  const unit = CATALOGUE.find(u => u.code === code)
  if (!unit) throw new RangeError(`unknown unit ${code}`)
  return unit
}
