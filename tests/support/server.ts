import { fileURLToPath } from 'node:url'
import { setup } from '@nuxt/test-utils/e2e'

export const ROOT = fileURLToPath(new URL('../..', import.meta.url))

/**
 * Starts the one build (made by scripts/test.sh) against the test PostgreSQL. `TEST: ''` keeps
 * Nitro's scheduled tasks running, as they would in production.
 */
export async function setupBuiltServer(env: Record<string, string> = {}, options: { port?: number } = {}) {
  await setup({
    rootDir: ROOT,
    build: false,
    server: true,
    nuxtConfig: { nitro: { output: { dir: `${ROOT}/.output` } } },
    env: { TEST: '', ...env },
    setupTimeout: 180_000,
    ...options,
  })
}
