import { cpSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { workerChunkPlugin } from './server/workers/workerChunkPlugin'

// Migrations live in drizzle/ (drizzle-kit's default); the built server must find them next to
// itself, so the compiled hook copies them into .output/.
const migrationsDir = fileURLToPath(new URL('./drizzle', import.meta.url))
const evaluationWorker = fileURLToPath(new URL('./server/workers/evaluateRecordWorker.ts', import.meta.url))
// Domain services (server/services/<domain>/) are auto-imported by routes and tasks, like the
// framework glue in server/utils; inside services every import is explicit (docs/architecture.md §A2).
const servicesDir = fileURLToPath(new URL('./server/services', import.meta.url))

export default defineNuxtConfig({
  compatibilityDate: '2025-07-15',
  devtools: { enabled: false },
  telemetry: false,
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', 'nuxt-auth-utils', '@vueuse/nuxt', '@nuxt/eslint', 'nuxt-security'],
  // Response headers and the content security policy (issue 13 item 4). Only nuxt-security's
  // headers are used: request checks live in server/middleware (same-origin writes, methods, body
  // limits) and sign-in limits in server/services/accounts, because its own limiters read whole
  // bodies by their declared length and count in one process's memory.
  security: {
    headers: {
      contentSecurityPolicy: {
        'default-src': ["'self'"],
        'base-uri': ["'none'"],
        'connect-src': ["'self'"],
        // @fontsource files are bundled as assets; Vite may inline small ones as data: URLs.
        'font-src': ["'self'", 'data:'],
        'form-action': ["'self'"],
        'frame-ancestors': ["'none'"],
        'frame-src': ["'none'"],
        'img-src': ["'self'", 'data:'],
        'object-src': ["'none'"],
        // Nuxt's inline payload and entry scripts carry the per-response nonce; what they load is trusted by it.
        'script-src': ["'self'", "'strict-dynamic'", "'nonce-{{nonce}}'"],
        'script-src-attr': ["'none'"],
        // Vue renders :style bindings as style attributes in the server's HTML.
        'style-src': ["'self'", "'unsafe-inline'"],
        'worker-src': ["'self'"],
        // Served over plain HTTP on a console network or behind a TLS proxy: never rewrite to https here.
        'upgrade-insecure-requests': false,
      },
      xFrameOptions: 'DENY',
      // no-referrer would make browsers send 'Origin: null' on our own writes (Fetch standard),
      // which the same-origin check refuses; same-origin keeps the Referer inside the app.
      referrerPolicy: 'same-origin',
      // includeSubDomains would bind every host of the plant's domain to HTTPS; that is the site's call.
      strictTransportSecurity: { maxAge: 31536000, includeSubdomains: false },
    },
    rateLimiter: false,
    requestSizeLimiter: false,
    xssValidator: false,
    corsHandler: false,
    allowedMethodsRestricter: false,
    // Keep console output: the server logs its own failures there.
    removeLoggers: false,
  },
  css: ['@fontsource/roboto-mono/400.css', '@fontsource/roboto-mono/700.css', '~/assets/css/main.css'],
  app: {
    head: {
      title: 'Brinkline',
      htmlAttrs: { lang: 'en' },
      meta: [{ name: 'viewport', content: 'width=device-width, initial-scale=1' }],
    },
  },
  runtimeConfig: {
    databaseUrl: '',
    // The schema owner's address (NUXT_MIGRATION_DATABASE_URL): migrations and the storage job run
    // as it; the app's own address (NUXT_DATABASE_URL) is a role that owns no tables. Empty: one role.
    migrationDatabaseUrl: '',
    smtpUrl: '',
    mailFrom: 'Brinkline <brinkline@localhost>',
    publicUrl: 'http://127.0.0.1:3000',
    // An activation older than this when recorded came from back-filled or uploaded history: no
    // mail of its own, one summary per site instead (NUXT_NOTIFY_MAX_AGE_MINUTES; docs/design.md §D4).
    notify: { maxAgeMinutes: 30 },
    // Scheduled pipeline ticks and mail sending, per instance (NUXT_PIPELINE_SCHEDULED=false …).
    pipeline: { scheduled: true },
    sender: { scheduled: true },
    // The hourly storage job (partitions, raw windows, size snapshots; NUXT_STORAGE_SCHEDULED=false).
    storage: { scheduled: true },
    session: { maxAge: 60 * 60 * 12 },
    // Inactivity limit beside the 12 h absolute one (NIST SP 800-63B AAL2: 30 minutes).
    sessionIdleMinutes: 30,
    // How far ahead of this server's clock a sample may be stamped (NUXT_INGEST_MAX_FUTURE_SKEW_S).
    // Requests per gateway key and minute (NUXT_INGEST_REQUESTS_PER_MINUTE): a gateway sends a batch
    // every few seconds and a backlog in batches of up to 10,000 samples, so 1,200 leaves it room.
    ingest: { maxFutureSkewS: 300, requestsPerMinute: 1200 },
    // Sign-in limits (server/services/accounts/signInLimits.ts; NUXT_SIGN_IN_WINDOW_S …). After 5
    // failures in a row an account waits 15 minutes at that address, doubling up to a day; a run of
    // failures is forgotten a week after it began.
    signIn: {
      windowS: 900, perAccountAtAddress: 5, perAccount: 50, perAccountWindowS: 3600, perAddress: 100,
      maxWaitS: 86_400, failureMemoryS: 604_800,
    },
  },
  // API answers are the user's plant data: never kept by a browser or proxy cache.
  routeRules: { '/api/**': { headers: { 'cache-control': 'no-store' } } },
  nitro: {
    preset: 'node-server',
    experimental: { tasks: true },
    imports: { dirs: [`${servicesDir}/**/*`] },
    // Six-field cron (seconds first); fixed at build time, switched off at run time via runtimeConfig.
    scheduledTasks: {
      [process.env.NUXT_PIPELINE_CRON || '*/10 * * * * *']: ['indicators:refresh'],
      [process.env.NUXT_SENDER_CRON || '*/5 * * * * *']: ['notifications:send'],
      '30 * * * * *': ['replays:sweep'],
      [process.env.NUXT_STORAGE_CRON || '0 7 * * * *']: ['storage:maintain'],
    },
    // Tag evaluations run on worker threads, which load their code from a file of the bundle.
    rollupConfig: { plugins: [workerChunkPlugin(evaluationWorker, 'workers/evaluate-record.mjs')] },
    hooks: {
      compiled(nitro) {
        cpSync(migrationsDir, `${nitro.options.output.serverDir}/drizzle`, { recursive: true })
      },
    },
  },
  hooks: {
    // The API's route files and methods, for server/middleware/allowedMethods.ts (405 with Allow).
    'nitro:init'(nitro) {
      nitro.options.virtual['#brinkline/api-routes'] = () => `export default ${JSON.stringify(
        nitro.scannedHandlers.filter(h => h.route?.startsWith('/api/')).map(h => ({ route: h.route, method: h.method })),
      )}`
    },
    // Our handler answers database outages with 503 first; Nuxt's own handler renders the rest.
    'nitro:config'(config) {
      const existing = config.errorHandler ? [config.errorHandler].flat() : []
      config.errorHandler = [fileURLToPath(new URL('./server/error.ts', import.meta.url)), ...existing]
    },
  },
  // Lint rules only, no formatting: the code keeps its own layout (docs/style.md).
  eslint: { config: { stylistic: false } },
  tailwindcss: { cssPath: false, viewer: false },
  typescript: { strict: true },
})
