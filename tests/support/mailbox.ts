import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { startLocalMailbox } from '../../scripts/mailbox/localMailbox'

/** The local SMTP mailbox on free ports, and the env that points the server at it. */
export async function startTestMailbox() {
  const mailbox = await startLocalMailbox({ smtpPort: 0, httpPort: 0, dir: mkdtempSync(join(tmpdir(), 'brinkline-mail-')) })
  return { mailbox, smtpUrl: `smtp://127.0.0.1:${mailbox.smtpPort}` }
}

/** Env for a server whose ticks the test drives itself through the test-only route. */
export const MANUAL_TICKS_ENV = {
  BRINKLINE_TEST_ROUTES: '1',
  NUXT_PIPELINE_SCHEDULED: 'false',
  NUXT_SENDER_SCHEDULED: 'false',
  NUXT_STORAGE_SCHEDULED: 'false',
  NUXT_PUBLIC_URL: 'http://brinkline.test:3000',
}
