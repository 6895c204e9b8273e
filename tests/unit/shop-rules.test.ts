import { describe, expect, it } from 'vitest'
import {
  canCancelOrder,
  canSeeOrder,
  canSeeOrderDocuments,
  canSeeQuote,
  isQuoteValid,
  unitsLeft,
} from '../../shared/utils/shop-rules'

const teacherA = { role: 'teacher' as const, schoolId: 1 }
const teacherB = { role: 'teacher' as const, schoolId: 2 }
const order = { schoolId: 1, status: 'po review' as const }

describe('who sees an order', () => {
  it('lets a teacher see only their own school\'s orders and quotes', () => {
    expect(canSeeOrder(teacherA, order)).toBe(true)
    expect(canSeeOrder(teacherB, order)).toBe(false)
    expect(canSeeQuote(teacherB, order)).toBe(false)
    expect(canSeeOrder({ role: 'teacher', schoolId: null }, order)).toBe(false)
    expect(canSeeOrder(null, order)).toBe(false)
  })

  it('keeps builders out, gives support context without documents, and admins everything', () => {
    expect(canSeeOrder({ role: 'builder', schoolId: 1 }, order)).toBe(false)
    expect(canSeeOrder({ role: 'support', schoolId: null }, order)).toBe(true)
    expect(canSeeOrderDocuments({ role: 'support', schoolId: null }, order)).toBe(false)
    expect(canSeeQuote({ role: 'support', schoolId: null }, order)).toBe(false)
    expect(canSeeOrderDocuments({ role: 'admin', schoolId: null }, order)).toBe(true)
  })
})

describe('order steps', () => {
  it('lets the buyer or an admin cancel only an unpaid order', () => {
    expect(canCancelOrder(teacherA, order)).toBe(true)
    expect(canCancelOrder(teacherB, order)).toBe(false)
    expect(canCancelOrder(teacherA, { ...order, status: 'paid' })).toBe(false)
    expect(
      canCancelOrder({ role: 'admin', schoolId: null }, { ...order, status: 'awaiting payment' }),
    ).toBe(true)
    expect(canCancelOrder({ role: 'support', schoolId: null }, order)).toBe(false)
    expect(canCancelOrder(teacherA, { ...order, status: 'rejected' })).toBe(false)
  })
})

describe('quotes and stock', () => {
  it('treats a quote as valid until its date and only once', () => {
    const now = new Date('2026-11-10T00:00:00Z')
    expect(isQuoteValid({ validUntil: '2026-11-11T00:00:00Z', orderId: null }, now)).toBe(true)
    expect(isQuoteValid({ validUntil: '2026-11-09T00:00:00Z', orderId: null }, now)).toBe(false)
    expect(isQuoteValid({ validUntil: '2026-11-11T00:00:00Z', orderId: 4 }, now)).toBe(false)
  })

  it('never shows a batch below zero', () => {
    expect(unitsLeft({ quantityBuilt: 10, reserved: 4 })).toBe(6)
    expect(unitsLeft({ quantityBuilt: 3, reserved: 5 })).toBe(0)
  })
})

describe('shop links in the header', () => {
  it(
    'shows the shop to visitors and teachers, not to builders, and the cart only '
    + 'to buyers', async () => {
      const { navigationFor } = await import('../../shared/utils/roles')
      const labels = (u: Parameters<typeof navigationFor>[0]) => navigationFor(u).map(l => l.label)
      expect(labels(null)).toEqual(expect.arrayContaining(['Kits', 'Cart']))
      expect(labels(null)).not.toContain('Orders')
      expect(labels({ role: 'teacher' })).toEqual(
        expect.arrayContaining(['Kits', 'Cart', 'Quotes', 'Orders']),
      )
      expect(labels({ role: 'builder' })).not.toEqual(expect.arrayContaining(['Kits']))
      expect(labels({ role: 'builder' })).not.toContain('Cart')
      expect(labels({ role: 'admin' })).not.toContain('Cart')
    })
})
