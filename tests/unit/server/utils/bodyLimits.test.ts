import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { bodyLimitFor, DEFAULT_BODY_BYTES, describeBytes, namedBodyLimits } from '../../../../server/utils/bodyLimits'
import { incidentFindingsSchema } from '../../../../shared/schemas/incident'
import { opcuaMappingsSchema } from '../../../../shared/schemas/opcua'
import { ingestBatchSchema, MAX_BATCH_SAMPLES } from '../../../../shared/schemas/ingest'

const ROOT_DIR = fileURLToPath(new URL('../../../..', import.meta.url))

// A JSON text writes a control character as a six-byte \u escape (RFC 8259 §7), the widest form a
// character can take: the largest bodies below are built from U+0001, which JSON.stringify escapes
// so (ECMA-262 §25.5.2.3 QuoteJSONString).
const widest = (chars: number) => '\u0001'.repeat(chars)
const bytesOf = (body: unknown) => Buffer.byteLength(JSON.stringify(body))

describe('body limits per route (issue 13 item 6)', () => {
  it('gives ordinary JSON routes the default, whatever the method or a trailing slash', () => {
    expect(bodyLimitFor('POST', '/api/public/sign-in')).toBe(DEFAULT_BODY_BYTES)
    expect(bodyLimitFor('GET', '/api/incidents/7')).toBe(DEFAULT_BODY_BYTES)
    expect(bodyLimitFor('PATCH', '/api/incidents/7/')).toBeGreaterThan(DEFAULT_BODY_BYTES)
    expect(bodyLimitFor('PATCH', '/api/incidents/7/state')).toBe(DEFAULT_BODY_BYTES)
  })

  it('fits the largest findings change the schema accepts, which the default would refuse', () => {
    const body = { title: widest(200), whatHappened: widest(8000), cause: widest(8000), actions: widest(8000), lessons: widest(8000) }
    expect(incidentFindingsSchema.safeParse(body).success).toBe(true)
    expect(bytesOf(body)).toBeGreaterThan(DEFAULT_BODY_BYTES)
    expect(bytesOf(body)).toBeLessThanOrEqual(bodyLimitFor('PATCH', '/api/incidents/7'))
  })

  it('fits the largest node-to-tag table the schema accepts, which the default would refuse', () => {
    const mappings = Array.from({ length: 2000 }, (_, i) => ({ nodeId: `s=${widest(498 - String(i).length)}${i}`, tagId: 2_147_483_647 - i }))
    expect(opcuaMappingsSchema.safeParse({ mappings }).success).toBe(true)
    expect(bytesOf({ mappings })).toBeGreaterThan(DEFAULT_BODY_BYTES)
    expect(bytesOf({ mappings })).toBeLessThanOrEqual(bodyLimitFor('PUT', '/api/admin/opcua/3/mappings'))
  })

  it('fits a full ingest batch of long sample records in the ingest limit', () => {
    const samples = Array.from({ length: MAX_BATCH_SAMPLES }, (_, i) =>
      ({ tag: 'UNIT-12.FIC-4031.PV', time: new Date(Date.UTC(2026, 0, 5) + i * 1000).toISOString(), value: -12345.678901234, quality: 'uncertain' }))
    expect(ingestBatchSchema.safeParse({ samples }).success).toBe(true)
    expect(bytesOf({ samples })).toBeLessThanOrEqual(bodyLimitFor('POST', '/api/ingest'))
  })

  it('names only routes that exist, with that method', () => {
    for (const { method, route } of namedBodyLimits()) {
      const base = `${ROOT_DIR}server${route.replace(/:(\w+)/g, '[$1]')}`
      const files = [`${base}.${method.toLowerCase()}.ts`, `${base}/index.${method.toLowerCase()}.ts`]
      expect(files.some(existsSync), `${method} ${route}`).toBe(true)
    }
  })

  it('names a limit in binary units with its exact bytes (IEC 80000-13 prefixes)', () => {
    expect(describeBytes(65_536)).toBe('64 KiB (65536 bytes)')
    expect(describeBytes(4 * 1024 * 1024)).toBe('4 MiB (4194304 bytes)')
    expect(describeBytes(2 ** 30)).toBe('1 GiB (1073741824 bytes)')
    expect(describeBytes(193_456)).toBe('188.9 KiB (193456 bytes)')
    expect(describeBytes(500)).toBe('500 bytes')
  })
})
