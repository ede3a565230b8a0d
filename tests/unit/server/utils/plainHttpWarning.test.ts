import { describe, expect, it } from 'vitest'
import { plainHttpWarning } from '../../../../server/utils/plainHttpWarning'

// Browsers store a cookie with the Secure attribute only from a secure origin; http://localhost and
// loopback addresses count as potentially trustworthy (W3C Secure Contexts §3.1; RFC 6265bis
// "Secure" attribute) [common practice].
describe('start-up warning for plain HTTP on a plant host name', () => {
  it.each(['https://brinkline.plant.example', 'http://127.0.0.1:3000', 'http://localhost:3000', 'http://[::1]:3000', 'http://console.localhost'])(
    'stays quiet for %s', url => expect(plainHttpWarning(url)).toBeNull())

  it('warns for http:// on a host name or LAN address, naming the origin and the fix', () => {
    for (const url of ['http://brinkline.plant.example', 'http://10.20.0.5:3000']) {
      const warning = plainHttpWarning(url)
      expect(warning).toContain(new URL(url).origin)
      expect(warning).toContain('HTTPS behind a reverse proxy')
    }
  })

  it('says so when the address is not a URL at all', () => {
    expect(plainHttpWarning('brinkline:3000/x y')).toContain('is not an http(s) URL')
    expect(plainHttpWarning('not a url')).toContain('is not an http(s) URL')
  })
})
