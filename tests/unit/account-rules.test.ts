// Pure rules behind issue 8: client addresses behind proxies, the sign-in delays, masked links,
// ids in paths, text hygiene and where each role lands.
import { describe, expect, it } from 'vitest'
import { clientAddress, parseTrustedProxies } from '../../shared/utils/client-address'
import { delayAfter, THROTTLE } from '../../shared/utils/sign-in-rules'
import { maskSingleUseLinks } from '../../shared/utils/mask-links'
import { isDisguisedNumber } from '../../shared/utils/path-ids'
import { landingFor, canSeePrices } from '../../shared/utils/roles'
import { plainId, singleLine, multiLine, wholeNumber } from '../../shared/schemas/text'
import { z } from 'zod'

describe('clientAddress', () => {
  const trusted = parseTrustedProxies(' 10.0.0.1, ::ffff:10.0.0.2 ')
  it('ignores X-Forwarded-For from a peer that is no trusted proxy', () => {
    expect(clientAddress('::ffff:203.0.113.9', '1.2.3.4', trusted)).toBe('203.0.113.9')
  })
  it('takes the nearest untrusted hop behind trusted proxies', () => {
    expect(clientAddress('10.0.0.1', 'spoofed, 198.51.100.4, 10.0.0.2', trusted)).toBe(
      '198.51.100.4',
    )
    expect(clientAddress('10.0.0.1', '10.0.0.2', trusted)).toBe('10.0.0.1')
    expect(clientAddress('10.0.0.1', undefined, trusted)).toBe('10.0.0.1')
  })
})

describe('delayAfter', () => {
  it('lets the free attempts through, then doubles the wait up to the cap', () => {
    expect(Array.from({ length: THROTTLE.freeAttempts - 1 }, (_, i) => delayAfter(i + 1))).toEqual([
      0, 0, 0, 0,
    ])
    expect(delayAfter(THROTTLE.freeAttempts)).toBe(THROTTLE.firstDelayMs)
    expect(delayAfter(THROTTLE.freeAttempts + 1)).toBe(2 * THROTTLE.firstDelayMs)
    expect(delayAfter(40)).toBe(THROTTLE.maxDelayMs)
  })
})

describe('maskSingleUseLinks', () => {
  it('hides reset, invitation and confirmation tokens but the first four characters', () => {
    const text
      = 'Reset: http://x.test/reset-password/AbCdEfGhIjKlMnOpQrStUvWxYz_-12\nConfirm: '
        + 'http://x.test/verify-email?token=ZyXwVuTsRqPoNmLk'
    const masked = maskSingleUseLinks(text)
    expect(masked).toContain('reset-password/AbCd…(hidden)')
    expect(masked).toContain('verify-email?token=ZyXw…(hidden)')
    expect(masked).not.toContain('EfGh')
  })
})

describe('isDisguisedNumber', () => {
  it('flags numbers not written as plain decimal, and nothing else', () => {
    for (const s of ['0x1', '1e0', '01', '+1', '1.0', '%201', '0', '-3'])
      expect(isDisguisedNumber(s), s).toBe(true)
    for (const s of ['1', '42', 'import', 'invoice', 'long-beam-kit', ''])
      expect(isDisguisedNumber(s), s).toBe(false)
  })
})

describe('text schemas', () => {
  it('keeps control characters out of single-line fields and allows line breaks in notes', () => {
    const name = singleLine(z.string())
    expect(name.safeParse('Dana Ferrow').success).toBe(true)
    for (const bad of ['a\u0000b', 'a\nb', 'a\rb', 'a\u007fb', 'a\u0085b'])
      expect(name.safeParse(bad).success, JSON.stringify(bad)).toBe(false)
    const note = multiLine(z.string())
    expect(note.safeParse('line one\nline two\twith a tab').success).toBe(true)
    expect(note.safeParse('bell\u0007').success).toBe(false)
  })
  it('reads quantities and ids as whole decimal numbers only', () => {
    const q = wholeNumber('whole')
    expect(q.parse(3)).toBe(3)
    expect(q.parse('12')).toBe(12)
    for (const bad of [true, [3], '0x10', 2.5, '1e1', '', null])
      expect(q.safeParse(bad).success, JSON.stringify(bad)).toBe(false)
    const id = plainId('id')
    expect(id.parse('7')).toBe(7)
    for (const bad of ['0x1', '07', '0', -1, true])
      expect(id.safeParse(bad).success, JSON.stringify(bad)).toBe(false)
  })
})

describe('role words', () => {
  it(
    'lands builders at their rigs, staff at their desk, teachers at home; builders see '
    + 'no prices', () => {
      expect(landingFor({ role: 'builder' })).toBe('/rigs')
      expect(landingFor({ role: 'support' })).toBe('/help-queue')
      expect(landingFor({ role: 'admin' })).toBe('/staff')
      expect(landingFor({ role: 'teacher' })).toBe('/')
      expect(canSeePrices({ role: 'builder' })).toBe(false)
      expect(canSeePrices(null)).toBe(true)
    })
})

describe('safeFilename', async () => {
  const { safeFilename } = await import('../../server/services/files')
  it('keeps = and other ordinary punctuation, and drops what could break a header', () => {
    expect(safeFilename('C:\\scans\\PO=1234 (final), v2&3.pdf', 'application/pdf', 'po')).toBe(
      'PO=1234 (final), v2&3.pdf',
    )
    expect(safeFilename('a"b;c\r\nd.png', 'image/png', 'x')).toBe('abcd.png')
    expect(safeFilename('', 'image/png', 'fallback')).toBe('fallback.png')
  })
})

describe('parseMultipart', async () => {
  const { parseMultipart, dispositionParams } = await import('../../server/utils/multipart')
  it('keeps a file name with = and other punctuation, and the fields beside it', () => {
    const b = 'XyZ'
    const body = Buffer.from(
      [
        `--${b}`,
        'Content-Disposition: form-data; name="poNumber"',
        '',
        'PO-77',
        `--${b}`,
        'Content-Disposition: form-data; name="poFile"; filename="PO=1234; v2 (final).pdf"',
        'Content-Type: application/pdf',
        '',
        '%PDF-1.4 bytes',
        `--${b}--`,
        '',
      ].join('\r\n'),
    )
    const parts = parseMultipart(body, b)
    expect(parts.map(p => [p.name, p.filename, p.type, p.data.toString()])).toEqual([
      ['poNumber', undefined, undefined, 'PO-77'],
      ['poFile', 'PO=1234; v2 (final).pdf', 'application/pdf', '%PDF-1.4 bytes'],
    ])
    expect(dispositionParams('; name=plain; filename="a\\"b.pdf"')).toEqual({
      name: 'plain',
      filename: 'a"b.pdf',
    })
  })
})
