import { describe, expect, it } from 'vitest'
import { containsPattern, pageWindow } from '../../shared/utils/paging'
import { shipmentCarrier } from '../../shared/utils/shipments'

describe('pageWindow', () => {
  it.each([
    // page, pageSize, total → page, pages, offset
    [1, 20, 0, 1, 1, 0],
    [1, 20, 45, 1, 3, 0],
    [3, 20, 45, 3, 3, 40],
    [2, 20, 40, 2, 2, 20],
    [9, 20, 45, 3, 3, 40],
    [4, 10, 30, 3, 3, 20],
    [5, 10, 0, 1, 1, 0],
  ])('page %i of %i rows out of %i: page %i of %i at offset %i', (
    page, size, total, at, pages, offset,
  ) => {
    const w = pageWindow(page, size, total)
    expect(w.meta).toEqual({ total, page: at, pageSize: size, pages })
    expect(w.offset).toBe(offset)
    expect(w.limit).toBe(size)
  })
})

describe('containsPattern', () => {
  it('escapes the LIKE wildcards and the escape character itself', () => {
    expect(containsPattern('ada')).toBe('%ada%')
    expect(containsPattern('100%')).toBe('%100\\%%')
    expect(containsPattern('a_b')).toBe('%a\\_b%')
    expect(containsPattern('c:\\x')).toBe('%c:\\\\x%')
  })
})

describe('shipmentCarrier', () => {
  it('names a known carrier and links its tracking page, the number encoded', () => {
    const s = shipmentCarrier('ups', '1Z 999/AA')
    expect(s).toMatchObject({ carrier: 'ups', carrierName: 'UPS' })
    expect(s.trackingUrl).toBe('https://www.ups.com/track?tracknum=1Z%20999%2FAA')
  })

  it('gives "other" and an older free-text carrier no link', () => {
    expect(shipmentCarrier('other', 'X1')).toEqual({
      carrier: 'other',
      carrierName: 'Other carrier',
      trackingUrl: null,
    })
    expect(shipmentCarrier('Ridgeline Freight', 'RF 1')).toEqual({
      carrier: 'Ridgeline Freight',
      carrierName: 'Ridgeline Freight',
      trackingUrl: null,
    })
  })
})
