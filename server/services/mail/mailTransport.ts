import { createTransport } from 'nodemailer'
import { useRuntimeConfig } from 'nitropack/runtime'

/** What the sender needs of a mail transport (a test can hand in its own). */
export interface MailTransport {
  sendMail(message: {
    from: string, to: string[], subject: string, text: string, messageId: string, headers?: Record<string, string>
  }): Promise<unknown>
}

let cached: { url: string, transport: MailTransport } | undefined

/** nodemailer on runtimeConfig.smtpUrl (NUXT_SMTP_URL); null when no relay is configured. */
export function useMailTransport(): MailTransport | null {
  const url = useRuntimeConfig().smtpUrl
  if (!url) return null
  if (cached?.url !== url) {
    // Short timeouts: the outbox row stays locked while a message is handed over.
    cached = {
      url,
      transport: createTransport({ url, connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 20_000 } as never),
    }
  }
  return cached.transport
}
