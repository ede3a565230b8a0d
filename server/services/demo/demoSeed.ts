import { and, eq } from 'drizzle-orm'
import { CATALOGUE, DEMO_COMPANY, DEMO_SITE } from '#shared/demo/catalogue'
import { gateways, sites, tags, units, users } from '../../db/schema'
import type { Role } from '#shared/utils/roles'
import type { Db } from '../../utils/db'
import { seedDemoAlarmRules } from './demoAlarmRules'
import { hashIngestKey } from '../ingest/gateways'

export const DEMO_USERS: ReadonlyArray<{ email: string, name: string, role: Role }> = [
  { email: 'operator@harrowgate.example', name: 'Olu Mensah', role: 'operator' },
  { email: 'engineer@harrowgate.example', name: 'Edith Varga', role: 'engineer' },
  { email: 'supervisor@harrowgate.example', name: 'Sam Okafor', role: 'supervisor' },
  { email: 'admin@harrowgate.example', name: 'Ada Lindqvist', role: 'admin' },
]

/**
 * Creates the invented demo site once: its units and tags (from the simulators' catalogue) and
 * one user per role. Idempotent: existing rows are left as they are, so edits made in the app
 * survive a restart.
 */
export const DEMO_GATEWAY = 'Demo plant simulators'

export async function seedDemo(db: Db, password: string, hash: (p: string) => Promise<string>, simulatorKey?: string): Promise<void> {
  const passwordHash = await hash(password)
  await db.transaction(async (tx) => {
    await tx.insert(users).values(DEMO_USERS.map(u => ({ ...u, passwordHash }))).onConflictDoNothing()
    await tx.insert(sites).values({ code: 'FW', name: DEMO_SITE, company: DEMO_COMPANY, timeZone: 'Europe/London' })
      .onConflictDoNothing()
    const [site] = await tx.select().from(sites).where(eq(sites.code, 'FW'))
    for (const unit of CATALOGUE) {
      const [code, ...rest] = unit.name.split(' ')
      await tx.insert(units).values({ siteId: site!.id, code: code!, name: rest.join(' '), kind: unit.kind, description: unit.description })
        .onConflictDoNothing()
      const [row] = await tx.select().from(units).where(and(eq(units.siteId, site!.id), eq(units.code, code!)))
      await tx.insert(tags).values(unit.tags.map(t => ({
        siteId: site!.id, unitId: row!.id, code: t.code, description: t.description, engineeringUnit: t.engineeringUnit,
        samplePeriodS: t.samplePeriodSeconds, rangeLow: t.rangeLow, rangeHigh: t.rangeHigh, noiseFloor: t.noiseFloor, quantisationStep: t.resolution,
      }))).onConflictDoNothing()
    }
    await seedDemoAlarmRules(tx, site!.id)
    // The simulators' key comes from the start command's credentials file; follow it if remade.
    if (simulatorKey) {
      const keyFields = { keyHash: hashIngestKey(simulatorKey), keyPrefix: simulatorKey.slice(0, 8), revokedAt: null }
      await tx.insert(gateways).values({ siteId: site!.id, name: DEMO_GATEWAY, ...keyFields })
        .onConflictDoUpdate({ target: [gateways.siteId, gateways.name], set: keyFields })
    }
  })
}
