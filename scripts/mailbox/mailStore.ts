// Messages the local mailbox has received, kept in memory and appended to a JSON-lines file so they
// survive a restart of the demo.
import { appendFile, mkdir, readFile, writeFile } from 'node:fs/promises'
import { join } from 'node:path'

export interface CaughtMessage {
  id: string
  from: string
  to: string[]
  subject: string
  text: string
  html: string
  /** The message's Date header (ISO), or when it arrived if it had none. */
  date: string
  receivedAt: string
}

export class MailStore {
  private messages: CaughtMessage[] = []
  private readonly file: string

  constructor(private readonly dir: string) {
    this.file = join(dir, 'messages.jsonl')
  }

  async load(): Promise<void> {
    await mkdir(this.dir, { recursive: true })
    const content = await readFile(this.file, 'utf8').catch(() => '')
    this.messages = content.split('\n').filter(line => line.trim()).map(line => JSON.parse(line) as CaughtMessage)
  }

  async add(message: CaughtMessage): Promise<void> {
    this.messages.push(message)
    await appendFile(this.file, `${JSON.stringify(message)}\n`)
  }

  /** Newest first. */
  list(): CaughtMessage[] {
    return [...this.messages].reverse()
  }

  get(id: string): CaughtMessage | undefined {
    return this.messages.find(m => m.id === id)
  }

  async clear(): Promise<void> {
    this.messages = []
    await writeFile(this.file, '')
  }
}
