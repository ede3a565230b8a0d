import type { CatalogueTag } from '../../shared/demo/catalogue'
import type { Normal } from './random'

export type Quality = 'good' | 'uncertain' | 'bad'

export interface Reading { value: number; quality: Quality }

/**
 * What a transmitter reports for a true process value: its own noise, then quantisation to its
 * resolution, then saturation at the range ends. A saturated reading is marked uncertain, since
 * the true value may lie beyond it [common practice].
 */
export function readSensor(trueValue: number, tag: CatalogueTag, normal: Normal): Reading {
  const noisy = trueValue + tag.noiseFloor * normal()
  const clamped = Math.min(tag.rangeHigh, Math.max(tag.rangeLow, noisy))
  return {
    value: quantise(clamped, tag.resolution),
    quality: clamped === noisy ? 'good' : 'uncertain',
  }
}

/** Round to a multiple of the resolution without binary artefacts such as 351.20000000000005. */
export function quantise(value: number, resolution: number): number {
  const decimals = Math.max(0, Math.ceil(-Math.log10(resolution) - 1e-9))
  return Number((Math.round(value / resolution) * resolution).toFixed(decimals))
}
