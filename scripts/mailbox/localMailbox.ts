// The local development mailbox for the demo and tests: an SMTP server on loopback that accepts every
// message (no auth, no TLS), stores it, and shows it over HTTP.
//   npx tsx scripts/mailbox/localMailbox.ts   (MAIL_SMTP_PORT=1025, MAIL_HTTP_PORT=1080, MAIL_DIR=.data/mail)
import { randomUUID } from 'node:crypto'
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http'
import type { AddressInfo } from 'node:net'
import { pathToFileURL } from 'node:url'
import { simpleParser, type AddressObject } from 'mailparser'
import { SMTPServer } from 'smtp-server'
import { inboxPage, messagePage } from './mailPages'
import { MailStore } from './mailStore'

export interface LocalMailboxOptions {
  host?: string
  /** 0 picks a free port. */
  smtpPort: number
  httpPort: number
  dir: string
}

export interface RunningLocalMailbox {
  smtpPort: number
  httpPort: number
  store: MailStore
  close(): Promise<void>
}

/** Recipient addresses, one entry each. */
function addresses(header: AddressObject | AddressObject[] | undefined): string[] {
  if (!header) return []
  return (Array.isArray(header) ? header : [header]).flatMap(h => h.value.map(v => v.address ?? v.name))
}

export async function startLocalMailbox(options: LocalMailboxOptions): Promise<RunningLocalMailbox> {
  const host = options.host ?? '127.0.0.1'
  const store = new MailStore(options.dir)
  await store.load()

  const smtp = new SMTPServer({
    // Auth optional, but any login a mailer insists on is accepted, so an app configured with
    // credentials can still send here; no TLS on loopback.
    authOptional: true,
    allowInsecureAuth: true,
    onAuth(auth, _session, callback) { callback(null, { user: auth.username ?? 'demo' }) },
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 20 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          const receivedAt = new Date().toISOString()
          const envelopeTo = session.envelope.rcptTo.map(r => r.address)
          await store.add({
            id: randomUUID(),
            from: parsed.from?.text ?? (session.envelope.mailFrom || { address: '' }).address,
            to: addresses(parsed.to).length ? addresses(parsed.to) : envelopeTo,
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : '',
            date: parsed.date?.toISOString() ?? receivedAt,
            receivedAt,
          })
          callback()
        })
        .catch(error => callback(error as Error))
    },
  })
  await new Promise<void>((resolve, reject) => {
    smtp.once('error', reject)
    smtp.listen(options.smtpPort, host, () => { smtp.off('error', reject); resolve() })
  })

  const http = createServer((req, res) => {
    handleHttp(store, req, res).catch((error) => {
      console.error('[localMailbox]', error)
      if (!res.headersSent) send(res, 500, 'text/plain', 'Internal error')
    })
  })
  await listen(http, options.httpPort, host)

  return {
    smtpPort: (smtp.server.address() as AddressInfo).port,
    httpPort: (http.address() as AddressInfo).port,
    store,
    close: async () => {
      await new Promise<void>(resolve => smtp.close(() => resolve()))
      http.closeAllConnections()
      await new Promise<void>(resolve => http.close(() => resolve()))
    },
  }
}

function listen(server: Server, port: number, host: string): Promise<void> {
  return new Promise((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, host, () => { server.off('error', reject); resolve() })
  })
}

function send(res: ServerResponse, status: number, type: string, body: string): void {
  res.writeHead(status, { 'Content-Type': `${type}; charset=utf-8`, 'Cache-Control': 'no-store' })
  res.end(body)
}

async function handleHttp(store: MailStore, req: IncomingMessage, res: ServerResponse): Promise<void> {
  const path = new URL(req.url ?? '/', 'http://localhost').pathname
  const method = req.method ?? 'GET'
  const idMatch = /^\/(?:api\/)?messages\/([^/]+)$/.exec(path)
  const message = idMatch ? store.get(decodeURIComponent(idMatch[1]!)) : undefined

  if (method === 'GET' && path === '/') return send(res, 200, 'text/html', inboxPage(store.list()))
  if (method === 'GET' && path === '/api/messages') return send(res, 200, 'application/json', JSON.stringify(store.list()))
  if (method === 'DELETE' && path === '/api/messages') {
    await store.clear()
    res.writeHead(204).end()
    return
  }
  if (method === 'GET' && idMatch) {
    if (!message) return send(res, 404, 'text/plain', `Message ${idMatch[1]} not found`)
    return path.startsWith('/api/')
      ? send(res, 200, 'application/json', JSON.stringify(message))
      : send(res, 200, 'text/html', messagePage(message))
  }
  send(res, 404, 'text/plain', `Nothing at ${method} ${path}`)
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const mailbox = await startLocalMailbox({
    smtpPort: Number(process.env.MAIL_SMTP_PORT ?? 1025),
    httpPort: Number(process.env.MAIL_HTTP_PORT ?? 1080),
    dir: process.env.MAIL_DIR ?? '.data/mail',
  })
  console.log(`local mailbox: SMTP 127.0.0.1:${mailbox.smtpPort}, inbox http://127.0.0.1:${mailbox.httpPort}/`)
  const shutdown = () => { void mailbox.close().then(() => process.exit(0)) }
  process.once('SIGINT', shutdown)
  process.once('SIGTERM', shutdown)
}
