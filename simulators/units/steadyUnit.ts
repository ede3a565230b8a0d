// T-400: a feed tank whose temperature and level loops are well tuned and never change. It is
// the control: whatever the monitor does on the drifting units, it must stay quiet here.
import { integrate } from '../lib/eulerMaruyama'
import { sigmaForStandardDeviation, steadyLoopDerivative, type SteadyLoopParameters } from '../models/steady'
import type { SimulatedUnit, UnitOptions } from './simulatedUnit'

// Invented loops: temperature recovers in ~2 min, level in ~1 min.
export const FEED_TANK_TEMPERATURE: SteadyLoopParameters = { setpoint: 45, k: 1 / 120, sigma: sigmaForStandardDeviation(0.3, 1 / 120) }
export const FEED_TANK_LEVEL: SteadyLoopParameters = { setpoint: 62, k: 1 / 60, sigma: sigmaForStandardDeviation(0.8, 1 / 60) }

export function createSteadyUnit(options: UnitOptions): SimulatedUnit & { state(): number[] } {
  const loops = [FEED_TANK_TEMPERATURE, FEED_TANK_LEVEL]
  const derivative = (x: readonly number[]) => loops.map((loop, i) => steadyLoopDerivative(loop)([x[i]!])[0]!)
  let state = loops.map(loop => loop.setpoint)
  return {
    code: 'steady',
    state: () => [...state],
    advance(wallSeconds) {
      state = integrate(state, derivative, loops.map(l => l.sigma), wallSeconds * options.speed, 1, options.normal)
    },
    trueValues: () => ({ 'TI-401': state[0]!, 'LI-402': state[1]! }),
    describe: () => `temperature ${state[0]!.toFixed(2)} °C, level ${state[1]!.toFixed(1)} %`,
  }
}
