// The session cookie is Secure, and a browser only stores a Secure cookie from https:// or from
// the machine itself (localhost and loopback addresses count as secure). Served over plain HTTP
// under a plant host name, sign-in "succeeds" and the next page is signed out again, with no
// error anywhere: say so once at start-up instead.

const LOOPBACK_HOSTS = new Set(['localhost', '127.0.0.1', '[::1]', '::1'])

/** The warning for a public address that sign-in cannot work on, or null when it can. */
export function plainHttpWarning(publicUrl: string): string | null {
  let url: URL
  try {
    url = new URL(publicUrl)
  }
  catch {
    url = new URL('invalid:')
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:')
    return `NUXT_PUBLIC_URL "${publicUrl}" is not an http(s) URL: e-mail links and sign-in will not work`
  if (url.protocol === 'https:' || LOOPBACK_HOSTS.has(url.hostname) || url.hostname.endsWith('.localhost')) return null
  return `Brinkline is served at ${url.origin} over plain HTTP: browsers refuse its Secure session cookie there, `
    + 'so sign-in will appear to do nothing. Serve it over HTTPS behind a reverse proxy (README, "Serving on the plant network").'
}
