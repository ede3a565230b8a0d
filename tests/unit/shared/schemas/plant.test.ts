import { describe, expect, it } from 'vitest'
import { siteCreateSchema, tagCreateSchema, tagPatchSchema, unitCreateSchema } from '../../../../shared/schemas/plant'

const GOOD_TAG = {
  unitId: 1, code: 'TI-101', description: 'Reactor temperature', engineeringUnit: 'K', samplePeriodS: 1,
  rangeLow: 300, rangeHigh: 500, noiseFloor: 0.1, quantisationStep: 0.01,
}

/** The fields a failed parse names, as the 400 answer and the form show them. */
function fieldsOf(result: { success: boolean, error?: { issues: { path: (string | number)[] }[] } }): string[] {
  return result.success ? [] : result.error!.issues.map(i => i.path.join('.'))
}

describe('tag codes follow ISA-5.1 identification (letters, then the loop number)', () => {
  // ISA-5.1-2009 §4 examples of instrument identification: TIC-103, FT-101, PSV-200, LI-12 [common practice].
  it.each(['TI-101', 'TIC-103', 'FT-101', 'PSV-200', 'LI-12', 'FIC2301', '10-PT-205A'])('accepts %s', (code) => {
    expect(tagCreateSchema.safeParse({ ...GOOD_TAG, code }).success).toBe(true)
  })
  it('upper-cases a code typed in lower case', () => {
    expect(tagCreateSchema.parse({ ...GOOD_TAG, code: 'ti-101' }).code).toBe('TI-101')
  })
  it.each(['101', 'TI-', 'T I-101', 'TEMPERATURE-1', 'TI-1234567', 'TI_101'])('refuses %s naming the code field', (code) => {
    expect(fieldsOf(tagCreateSchema.safeParse({ ...GOOD_TAG, code }))).toEqual(['code'])
  })
})

describe('each tag field refuses a bad value by name', () => {
  it.each([
    ['samplePeriodS', 0], ['samplePeriodS', -1], ['samplePeriodS', 'fast'], ['noiseFloor', -0.1], ['quantisationStep', -1],
    ['engineeringUnit', ''], ['description', ''], ['unitId', 0], ['rangeLow', Number.NaN], ['loopRole', 'valve'],
  ])('%s = %s', (field, value) => {
    expect(fieldsOf(tagCreateSchema.safeParse({ ...GOOD_TAG, [field]: value }))).toContain(field)
  })
  it('range high must lie above range low', () => {
    expect(fieldsOf(tagCreateSchema.safeParse({ ...GOOD_TAG, rangeLow: 500, rangeHigh: 300 }))).toEqual(['rangeHigh'])
  })
  it('a noise floor as wide as the range is refused', () => {
    expect(fieldsOf(tagCreateSchema.safeParse({ ...GOOD_TAG, noiseFloor: 200 }))).toEqual(['noiseFloor'])
  })
  it('a loop link needs both the loop tag and the role', () => {
    expect(fieldsOf(tagCreateSchema.safeParse({ ...GOOD_TAG, loopTagId: 4, loopRole: null }))).toEqual(['loopRole'])
    expect(tagCreateSchema.safeParse({ ...GOOD_TAG, loopTagId: 4, loopRole: 'controller_output' }).success).toBe(true)
  })
  it('an edit names unknown fields and refuses an empty change', () => {
    expect(tagPatchSchema.safeParse({ siteId: 2 }).success).toBe(false)
    expect(tagPatchSchema.safeParse({}).success).toBe(false)
    expect(tagPatchSchema.parse({ noiseFloor: 0.2 })).toEqual({ noiseFloor: 0.2 })
  })
})

describe('sites and units', () => {
  it('a site needs an IANA time zone (IANA tz database names)', () => {
    const site = { code: 'NW', name: 'Northwick works', company: 'Example Ltd', timeZone: 'Europe/London' }
    expect(siteCreateSchema.safeParse(site).success).toBe(true)
    expect(siteCreateSchema.safeParse({ ...site, timeZone: 'America/Chicago' }).success).toBe(true)
    expect(fieldsOf(siteCreateSchema.safeParse({ ...site, timeZone: 'Mars/Olympus' }))).toEqual(['timeZone'])
  })
  it('unit codes are plant codes, named on refusal', () => {
    expect(fieldsOf(unitCreateSchema.safeParse({ siteId: 1, code: 'r 100', name: 'Reactor', kind: 'reactor' }))).toEqual(['code'])
    expect(unitCreateSchema.parse({ siteId: 1, code: 'r-100', name: 'Reactor', kind: 'reactor' })).toMatchObject({ code: 'R-100', description: '' })
  })
})
