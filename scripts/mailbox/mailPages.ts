// The local mailbox's two pages: an inbox and one message. Every value is escaped: mail content is
// untrusted, and HTML bodies are shown only inside a sandboxed frame with scripts off.
import type { CaughtMessage } from './mailStore'

export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!)
}

const STYLE = `body{font:14px/1.4 ui-monospace,monospace;margin:2rem;color:#22262a;background:#f4f5f6}
table{border-collapse:collapse;width:100%}td,th{text-align:left;padding:.3rem .6rem;border-bottom:1px solid #ccd}
a{color:#1d4f91}pre{white-space:pre-wrap;background:#fff;padding:1rem;border:1px solid #ccd}
iframe{width:100%;height:30rem;border:1px solid #ccd;background:#fff}`

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(title)}</title>`
    + `<style>${STYLE}</style></head><body>${body}</body></html>`
}

export function inboxPage(messages: readonly CaughtMessage[]): string {
  const rows = messages.map(m => `<tr><td>${escapeHtml(m.date)}</td><td>${escapeHtml(m.from)}</td>`
    + `<td>${escapeHtml(m.to.join(', '))}</td><td><a href="/messages/${encodeURIComponent(m.id)}">${escapeHtml(m.subject || '(no subject)')}</a></td></tr>`)
  const table = messages.length
    ? `<table><thead><tr><th>Date</th><th>From</th><th>To</th><th>Subject</th></tr></thead><tbody>${rows.join('')}</tbody></table>`
    : '<p>No messages yet.</p>'
  return page('Caught mail', `<h1>Caught mail (${messages.length})</h1>${table}`)
}

export function messagePage(m: CaughtMessage): string {
  const html = m.html ? `<h2>HTML</h2><iframe sandbox="" srcdoc="${escapeHtml(m.html)}"></iframe>` : ''
  return page(m.subject, `<p><a href="/">← all messages</a></p><h1>${escapeHtml(m.subject || '(no subject)')}</h1>`
    + `<p>From: ${escapeHtml(m.from)}<br>To: ${escapeHtml(m.to.join(', '))}<br>Date: ${escapeHtml(m.date)}</p>`
    + `<h2>Text</h2><pre>${escapeHtml(m.text)}</pre>${html}`)
}
