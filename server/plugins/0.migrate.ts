import { existsSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { migrate } from 'drizzle-orm/postgres-js/migrator'
import { grantAppRole } from '../utils/appRoleGrants'

// Migrations run at start-up so a new build never meets an old schema. The built server finds
// drizzle/ beside itself (copied by the compiled hook); dev and tests find it at the root.
function migrationsFolder(): string {
  const candidates = [
    join(dirname(fileURLToPath(import.meta.url)), '..', 'drizzle'),
    join(process.cwd(), '.output', 'server', 'drizzle'),
    join(process.cwd(), 'drizzle'),
  ]
  const found = candidates.find(dir => existsSync(join(dir, 'meta', '_journal.json')))
  if (!found) throw new Error(`Migrations not found in ${candidates.join(', ')}`)
  return found
}

let migrated: Promise<void> | undefined

/**
 * Runs pending migrations once, as the schema owner, then grants the app role what it may do;
 * after a failure (database down) the next caller tries again.
 */
export function ensureMigrated(): Promise<void> {
  migrated ??= migrateAndGrant().catch((err) => {
    migrated = undefined
    throw err
  })
  return migrated
}

/**
 * Resolves once this instance's schema is current: what a scheduled task waits for first, so its
 * first run after a start never meets tables the migrations are still making.
 */
export function schemaReady(): Promise<void> {
  return process.env.BRINKLINE_SKIP_MIGRATE === '1' ? Promise.resolve() : ensureMigrated()
}

async function migrateAndGrant() {
  const owner = useOwnerDb()
  await migrate(owner, { migrationsFolder: migrationsFolder() })
  const appRole = separateAppRole()
  if (appRole) await grantAppRole(owner, appRole)
}

export default defineNitroPlugin((nitroApp) => {
  if (process.env.BRINKLINE_SKIP_MIGRATE === '1') return
  ensureMigrated().then(() => console.log('[db] migrations applied'), err => console.error('[db] migration deferred:', err.message))
  // Nitro does not await plugins: API requests wait here until the schema is current.
  nitroApp.hooks.hook('request', async (event) => {
    if (event.path.startsWith('/api/')) await ensureMigrated()
  })
})
