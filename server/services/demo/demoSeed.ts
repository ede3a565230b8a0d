import { and, eq } from 'drizzle-orm'
import { CATALOGUE, DEMO_COMPANY, DEMO_SITE } from '#shared/demo/catalogue'
import { gateways, sites, tags, units, users } from '../../db/schema'
import type { Role } from '#shared/utils/roles'
import type { Db, DbTransaction } from '../../utils/db'
import { writeAudit } from '../../utils/audit'
import { seedDemoAlarmRules } from './demoAlarmRules'
import { seedDemoOpcuaConnection } from './demoOpcuaConnection'
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

export async function seedDemo(db: Db, password: string, hash: (p: string) => Promise<string>, simulatorKey?: string,
  opcuaEndpointUrl?: string): Promise<void> {
  // One hash per user, each with a salt of its own: one shared hash would tell anyone who reads
  // the table that the four accounts share a password.
  const demoUsers: (typeof DEMO_USERS[number] & { passwordHash: string })[] = []
  for (const u of DEMO_USERS) demoUsers.push({ ...u, passwordHash: await hash(password) })
  await db.transaction(async (tx) => {
    await tx.insert(users).values(demoUsers).onConflictDoNothing()
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
        samplePeriodS: t.samplePeriodSeconds, rangeLow: t.rangeLow, rangeHigh: t.rangeHigh, noiseFloor: t.noiseFloor,
        quantisationStep: t.resolution,
      }))).onConflictDoNothing()
    }
    await seedDemoAlarmRules(tx, site!.id)
    if (simulatorKey) await seedSimulatorGateway(tx, site!.id, simulatorKey)
    if (opcuaEndpointUrl) await seedDemoOpcuaConnection(tx, site!.id, opcuaEndpointUrl)
  })
}

/**
 * The simulators' gateway, keyed from the start command's credentials file. Created once; a key
 * the file remade is followed, with an audit record, but a gateway an admin revoked stays revoked:
 * a restart must never undo an admin's decision (the start command then says the simulators are
 * refused).
 */
async function seedSimulatorGateway(tx: DbTransaction, siteId: number, simulatorKey: string): Promise<void> {
  const keyFields = { keyHash: hashIngestKey(simulatorKey), keyPrefix: simulatorKey.slice(0, 8) }
  const [existing] = await tx.select().from(gateways).where(and(eq(gateways.siteId, siteId), eq(gateways.name, DEMO_GATEWAY))).for('update')
  if (!existing) {
    await tx.insert(gateways).values({ siteId, name: DEMO_GATEWAY, ...keyFields })
    return
  }
  if (existing.revokedAt) {
    console.warn(`[brinkline] the demo gateway "${DEMO_GATEWAY}" was revoked in the app; the simulators' samples will be refused until an admin issues a key`)
    return
  }
  if (existing.keyHash === keyFields.keyHash) return
  await tx.update(gateways).set(keyFields).where(eq(gateways.id, existing.id))
  await writeAudit(tx, {
    userId: null, action: 'gateway.rekey', target: DEMO_GATEWAY,
    detail: { id: existing.id, before: { keyPrefix: existing.keyPrefix }, after: { keyPrefix: keyFields.keyPrefix }, reason: 'the start command made a new simulator key' },
  })
}
