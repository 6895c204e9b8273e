import { describe, expect, it } from 'vitest'
import {
  ORDER_ACTIONS,
  ORDER_FLOW,
  ORDER_STATUSES,
  findTransition,
  flowWording,
  openActions,
  type Actor,
  type OrderAction,
  type OrderFacts,
} from '../../shared/utils/order-flow'

const po = (status: OrderFacts['status'], more: Partial<OrderFacts> = {}): OrderFacts => ({
  status,
  paymentMethod: 'purchase-order',
  allocated: false,
  paid: false,
  ...more,
})
const card = (status: OrderFacts['status'], more: Partial<OrderFacts> = {}): OrderFacts => ({
  status,
  paymentMethod: 'card',
  allocated: false,
  paid: false,
  ...more,
})

// The whole table, case by case: the order, the action, who asks, and where it ends (null:
// refused).
const CASES: [string, OrderFacts, OrderAction, Actor, string | null][] = [
  ['a teacher places a card order', card(null), 'placeCard', 'teacher', 'awaiting payment'],
  ['a teacher places a purchase order', po(null), 'placePurchaseOrder', 'teacher', 'po review'],
  ['an admin cannot place an order for a school', card(null), 'placeCard', 'admin', null],
  ['an admin approves a PO in review', po('po review'), 'approve', 'admin', 'awaiting payment'],
  ['a teacher cannot approve their own PO', po('po review'), 'approve', 'teacher', null],
  ['an approved PO cannot be approved again', po('awaiting payment'), 'approve', 'admin', null],
  [
    'an admin rejects a PO in review: rejected, not cancelled',
    po('po review'),
    'reject',
    'admin',
    'rejected',
  ],
  ['a card order is never "rejected"', card('awaiting payment'), 'reject', 'admin', null],
  [
    'an approved PO is allocated, keeping its state',
    po('awaiting payment'),
    'allocate',
    'admin',
    'awaiting payment',
  ],
  ['a PO in review is not packed yet', po('po review'), 'allocate', 'admin', null],
  ['an unpaid card order is not packed yet', card('awaiting payment'), 'allocate', 'admin', null],
  [
    'allocation happens once',
    card('paid', { allocated: true, paid: true }),
    'allocate',
    'admin',
    null,
  ],
  ['a cancelled order is not allocated', card('cancelled'), 'allocate', 'admin', null],
  [
    'a paid, allocated card order ships',
    card('paid', { allocated: true, paid: true }),
    'ship',
    'admin',
    'shipped',
  ],
  [
    'an unpaid card order does not ship',
    card('awaiting payment', { allocated: true }),
    'ship',
    'admin',
    null,
  ],
  ['nothing ships unallocated', card('paid', { paid: true }), 'ship', 'admin', null],
  [
    'an approved PO ships on net terms',
    po('awaiting payment', { allocated: true }),
    'ship',
    'admin',
    'shipped',
  ],
  ['a PO in review does not ship', po('po review', { allocated: true }), 'ship', 'admin', null],
  [
    'a cheque is recorded for an approved PO',
    po('awaiting payment'),
    'recordPayment',
    'admin',
    'paid',
  ],
  [
    'a cheque after shipping keeps it shipped',
    po('shipped', { allocated: true }),
    'recordPayment',
    'admin',
    'shipped',
  ],
  [
    'a paid order takes no second payment',
    po('shipped', { allocated: true, paid: true }),
    'recordPayment',
    'admin',
    null,
  ],
  [
    'card money is never recorded by hand',
    card('awaiting payment'),
    'recordPayment',
    'admin',
    null,
  ],
  ['the provider marks a card order paid', card('awaiting payment'), 'markPaid', 'system', 'paid'],
  [
    'an admin cannot mark paid as the provider',
    card('awaiting payment'),
    'markPaid',
    'admin',
    null,
  ],
  [
    'a payment for a cancelled order does not revive it',
    card('cancelled'),
    'markPaid',
    'system',
    null,
  ],
  ['a payment for a rejected PO does not revive it', po('rejected'), 'markPaid', 'system', null],
  [
    'a shipped order is delivered',
    card('shipped', { allocated: true, paid: true }),
    'markDelivered',
    'admin',
    'delivered',
  ],
  ['a teacher cancels an unpaid order', card('awaiting payment'), 'cancel', 'teacher', 'cancelled'],
  ['an admin cancels a PO in review', po('po review'), 'cancel', 'admin', 'cancelled'],
  ['a paid order is not cancelled here', card('paid', { paid: true }), 'cancel', 'admin', null],
  ['a shipped PO is not cancelled', po('shipped', { allocated: true }), 'cancel', 'admin', null],
  [
    'the sweep expires an unpaid card order',
    card('awaiting payment'),
    'expire',
    'system',
    'cancelled',
  ],
  ['the sweep never expires a purchase order', po('awaiting payment'), 'expire', 'system', null],
  [
    'late money for a cancelled order is refunded',
    card('cancelled'),
    'refund',
    'system',
    'cancelled',
  ],
  ['late money for a rejected PO is refunded', po('rejected'), 'refund', 'system', 'rejected'],
  [
    'a live order is not refunded by the flow',
    card('paid', { paid: true }),
    'refund',
    'system',
    null,
  ],
]

describe('the order flow, as a table', () => {
  it.each(CASES)('%s', (_what, order, action, actor, to) => {
    expect(findTransition(order, action, actor)?.to ?? null).toBe(to)
  })

  it('uses only known states and actions, and every action has a row', () => {
    for (const r of ORDER_FLOW) {
      if (r.from !== null) expect(ORDER_STATUSES).toContain(r.from)
      expect(ORDER_STATUSES).toContain(r.to)
    }
    for (const a of ORDER_ACTIONS) expect(ORDER_FLOW.some(r => r.action === a)).toBe(true)
  })

  it('never has two rows that could both apply', () => {
    for (const a of ORDER_FLOW) {
      for (const b of ORDER_FLOW) {
        if (a === b || a.action !== b.action || a.from !== b.from) continue
        const overlap
          = a.who.some(w => b.who.includes(w))
            && (a.method === undefined || b.method === undefined || a.method === b.method)
            && (a.allocated === undefined || b.allocated === undefined
              || a.allocated === b.allocated)
            && (a.paid === undefined || b.paid === undefined || a.paid === b.paid)
        expect(overlap, `${a.action} from ${a.from}`).toBe(false)
      }
    }
  })

  it('leaves nothing to do for an ended order but a refund', () => {
    expect(openActions(card('cancelled'), 'admin')).toEqual([])
    expect(openActions(po('rejected'), 'teacher')).toEqual([])
    expect(openActions(po('rejected'), 'system')).toEqual(['refund'])
  })

  // "Allocate" is offered once the order may be packed (paid, or its PO approved), and once.
  it.each([
    ['an unpaid card order', card('awaiting payment'), false],
    ['a paid card order', card('paid', { paid: true }), true],
    ['an allocated paid card order', card('paid', { paid: true, allocated: true }), false],
    ['a PO in review', po('po review'), false],
    ['an approved PO', po('awaiting payment'), true],
    ['an approved, allocated PO', po('awaiting payment', { allocated: true }), false],
    ['a paid PO', po('paid', { paid: true }), true],
    ['a shipped order', card('shipped', { paid: true, allocated: true }), false],
    ['a cancelled order', card('cancelled'), false],
    ['a rejected PO', po('rejected'), false],
  ] as const)('offers "allocate" for %s: %s', (_what, order, offered) => {
    expect(openActions(order, 'admin').includes('allocate')).toBe(offered)
    expect(openActions(order, 'teacher')).not.toContain('allocate')
  })

  it('offers an admin the buttons of a PO in review', () => {
    expect(openActions(po('po review'), 'admin')).toEqual(['approve', 'reject', 'cancel'])
  })

  // Replacement parts from a ticket: once the order is paid or its purchase order approved
  // (its build space is open), for support and admin only; the order's state stays as it is.
  describe('sendReplacement', () => {
    const open: [string, OrderFacts][] = [
      ['a paid card order', card('paid', { paid: true })],
      ['a paid, allocated card order', card('paid', { paid: true, allocated: true })],
      ['a shipped card order', card('shipped', { paid: true, allocated: true })],
      ['a delivered card order', card('delivered', { paid: true, allocated: true })],
      ['an approved PO awaiting payment', po('awaiting payment')],
      ['an approved, allocated PO awaiting payment', po('awaiting payment', { allocated: true })],
      ['a paid PO', po('paid', { paid: true })],
      ['a shipped PO, still unpaid', po('shipped', { allocated: true })],
      ['a delivered PO', po('delivered', { paid: true, allocated: true })],
    ]
    const closed: [string, OrderFacts][] = [
      ['a card order awaiting payment', card('awaiting payment')],
      ['a PO in review', po('po review')],
      ['a cancelled card order', card('cancelled')],
      ['a cancelled PO', po('cancelled')],
      ['a rejected PO', po('rejected')],
      ['an order not placed yet', card(null)],
    ]

    it.each(open)('is open to support and admin for %s, keeping its state', (_what, order) => {
      for (const actor of ['support', 'admin'] as const) {
        const row = findTransition(order, 'sendReplacement', actor)
        expect(row?.to).toBe(order.status)
        expect(openActions(order, actor)).toContain('sendReplacement')
      }
    })

    it.each(open)('is never open to the teacher or the system for %s', (_what, order) => {
      for (const actor of ['teacher', 'system'] as const)
        expect(findTransition(order, 'sendReplacement', actor)).toBeNull()
    })

    it.each(closed)('is closed for %s, whoever asks', (_what, order) => {
      for (const actor of ['support', 'admin', 'teacher', 'system'] as const)
        expect(findTransition(order, 'sendReplacement', actor)).toBeNull()
    })

    it('gives support no other step than replacement parts', () => {
      const orders = [...open, ...closed].map(([, o]) => o)
      for (const o of orders)
        for (const a of openActions(o, 'support')) expect(a).toBe('sendReplacement')
      expect(ORDER_FLOW.filter(r => r.who.includes('support')).every(
        r => r.action === 'sendReplacement')).toBe(true)
    })

    it('records who sent which parts on the timeline', () => {
      const row = findTransition(card('paid', { paid: true }), 'sendReplacement', 'support')!
      expect(flowWording(row, { actor: 'Ruth Okafor-Lane', reference: 'T-7: 1 × Beam' })).toBe(
        'Replacement parts sent free by Ruth Okafor-Lane: T-7: 1 × Beam.',
      )
    })
  })

  it('fills the timeline wording', () => {
    const row = findTransition(po('po review'), 'reject', 'admin')!
    expect(flowWording(row, { actor: 'Ada Admin', reason: 'PO unsigned!' })).toBe(
      'Purchase order rejected by Ada Admin: PO unsigned.',
    )
    expect(flowWording(row, { actor: 'Ada Admin' })).toBe(
      'Purchase order rejected by Ada Admin: no reason given.',
    )
  })
})
