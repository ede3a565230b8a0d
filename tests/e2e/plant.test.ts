import { describe, expect, it } from 'vitest'
import { CATALOGUE } from '../../shared/demo/catalogue'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

await setupBuiltServer()

describe('the seeded demo plant is served from PostgreSQL', () => {
  it('lists the site, its four units and every catalogue tag to any role', async () => {
    const cookie = await signInAs('operator')
    const sites = await call('/api/sites', { cookie })
    expect(sites.body).toHaveLength(1)
    const units = await call('/api/units', { cookie })
    expect(units.body).toHaveLength(CATALOGUE.length)
    const tags = await call('/api/tags', { cookie })
    const expected = CATALOGUE.flatMap(u => u.tags.map(t => t.code)).sort()
    expect(tags.body.map((t: { code: string }) => t.code).sort()).toEqual(expected)
  })
})
