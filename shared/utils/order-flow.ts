// The order's life as one table: from which state, which action, to which state, who may
// take it, and the words the timeline records. The server's order steps apply a row of it
// (server/utils/order-steps.ts) and the admin's order page offers the buttons it allows,
// so the two cannot drift apart.

export const ORDER_STATUSES = [
  'po review',
  'awaiting payment',
  'paid',
  'shipped',
  'delivered',
  'cancelled',
  'rejected',
] as const
export type OrderStatus = (typeof ORDER_STATUSES)[number]

export const PAYMENT_METHODS = ['card', 'purchase-order'] as const
export type PaymentMethod = (typeof PAYMENT_METHODS)[number]

export const ORDER_STATUS_LABELS: Record<OrderStatus, string> = {
  'po review': 'PO under review',
  'awaiting payment': 'Awaiting payment',
  'paid': 'Paid',
  'shipped': 'Shipped',
  'delivered': 'Delivered',
  'cancelled': 'Cancelled',
  'rejected': 'PO rejected',
}

/** States in which the order holds no stock and nothing more will happen to it. */
export const CLOSED_STATUSES: readonly OrderStatus[] = ['cancelled', 'rejected']

export const ORDER_ACTIONS = [
  'placeCard',
  'placePurchaseOrder',
  'approve',
  'reject',
  'allocate',
  'ship',
  'recordPayment',
  'markPaid',
  'markDelivered',
  'cancel',
  'expire',
  'refund',
  'sendReplacement',
] as const
export type OrderAction = (typeof ORDER_ACTIONS)[number]

/** The timeline entry's kind for each action. */
export const ACTION_EVENT: Record<OrderAction, string> = {
  placeCard: 'placed',
  placePurchaseOrder: 'placed',
  approve: 'po-approved',
  reject: 'po-rejected',
  allocate: 'allocated',
  ship: 'shipped',
  recordPayment: 'paid',
  markPaid: 'paid',
  markDelivered: 'delivered',
  cancel: 'cancelled',
  expire: 'cancelled',
  refund: 'refunded',
  sendReplacement: 'replacement-shipped',
}

/** Who takes a step: the school's teacher, an admin, support staff (replacement parts only), or
 *  Tiltwright itself (a webhook, a sweep). */
export type Actor = 'teacher' | 'admin' | 'support' | 'system'

export interface FlowRow {
  from: OrderStatus | null
  action: OrderAction
  to: OrderStatus
  who: readonly Actor[]
  /** Only for orders paid this way. */
  method?: PaymentMethod
  /** The step needs the order's units allocated (true) or not yet allocated (false). */
  allocated?: boolean
  /** The step needs the order paid (true) or unpaid (false). */
  paid?: boolean
  /** The timeline's words; {actor}, {reason}, {reference} and {amount} are filled in. */
  wording: string
}

const PO = 'purchase-order' as const
const UNPAID_OPEN: OrderStatus[] = ['po review', 'awaiting payment']

export const ORDER_FLOW: readonly FlowRow[] = [
  {
    from: null,
    action: 'placeCard',
    to: 'awaiting payment',
    who: ['teacher'],
    method: 'card',
    wording: 'Order placed by {actor}; stock reserved until it is paid.',
  },
  {
    from: null,
    action: 'placePurchaseOrder',
    to: 'po review',
    who: ['teacher'],
    method: PO,
    wording: 'Order placed by {actor} with a purchase order; stock reserved while it is reviewed.',
  },
  {
    from: 'po review',
    action: 'approve',
    to: 'awaiting payment',
    who: ['admin'],
    method: PO,
    wording: 'Purchase order approved by {actor}.',
  },
  {
    from: 'po review',
    action: 'reject',
    to: 'rejected',
    who: ['admin'],
    method: PO,
    wording: 'Purchase order rejected by {actor}: {reason}',
  },
  // Units are allocated once the order may be packed: paid, or a purchase order approved.
  {
    from: 'paid',
    action: 'allocate',
    to: 'paid',
    who: ['admin'],
    allocated: false,
    wording: 'Units allocated for packing: {reference}.',
  },
  {
    from: 'awaiting payment',
    action: 'allocate',
    to: 'awaiting payment',
    who: ['admin'],
    method: PO,
    allocated: false,
    wording: 'Units allocated for packing: {reference}.',
  },
  {
    from: 'paid',
    action: 'ship',
    to: 'shipped',
    who: ['admin'],
    allocated: true,
    wording: 'Shipped with {reference}.',
  },
  {
    from: 'awaiting payment',
    action: 'ship',
    to: 'shipped',
    who: ['admin'],
    method: PO,
    allocated: true,
    wording: 'Shipped with {reference}, on net terms.',
  },
  ...(['awaiting payment', 'shipped', 'delivered'] as const).map(
    (from): FlowRow => ({
      from,
      action: 'recordPayment',
      to: from === 'awaiting payment' ? 'paid' : from,
      who: ['admin'],
      method: PO,
      paid: false,
      wording: 'Payment of {amount} recorded by {actor} (reference {reference}).',
    }),
  ),
  ...(['awaiting payment', 'shipped', 'delivered'] as const).map(
    (from): FlowRow => ({
      from,
      action: 'markPaid',
      to: from === 'awaiting payment' ? 'paid' : from,
      who: ['system'],
      paid: false,
      wording: 'Payment of {amount} received ({reference}).',
    }),
  ),
  {
    from: 'shipped',
    action: 'markDelivered',
    to: 'delivered',
    who: ['admin'],
    wording: 'Delivered.',
  },
  ...UNPAID_OPEN.map(
    (from): FlowRow => ({
      from,
      action: 'cancel',
      to: 'cancelled',
      who: ['teacher', 'admin'],
      paid: false,
      wording: 'Cancelled by {actor}: {reason}',
    }),
  ),
  {
    from: 'awaiting payment',
    action: 'expire',
    to: 'cancelled',
    who: ['system'],
    method: 'card',
    paid: false,
    wording:
      'The card payment was not completed within {reference} hours, so the order was cancelled.',
  },
  // Free parts sent from a ticket, once the order is paid or its purchase order approved (its
  // build space is open); the order's state does not change.
  ...(['awaiting payment', 'paid', 'shipped', 'delivered'] as const).map(
    (from): FlowRow => ({
      from,
      action: 'sendReplacement',
      to: from,
      who: ['support', 'admin'],
      ...(from === 'awaiting payment' ? { method: PO } : {}),
      wording: 'Replacement parts sent free by {actor}: {reference}.',
    }),
  ),
  ...CLOSED_STATUSES.map(
    (from): FlowRow => ({
      from,
      action: 'refund',
      to: from,
      who: ['system'],
      wording:
        'A payment of {amount} arrived after the order had ended; it was refunded in full '
        + '({reference}).',
    }),
  ),
]

export interface OrderFacts {
  status: OrderStatus | null
  paymentMethod: PaymentMethod
  allocated: boolean
  paid: boolean
}

/** The row that applies, or null when the action is not open for this order and actor. */
export function findTransition(
  order: OrderFacts,
  action: OrderAction,
  actor: Actor,
): FlowRow | null {
  return (
    ORDER_FLOW.find(
      r =>
        r.action === action
        && r.from === order.status
        && r.who.includes(actor)
        && (r.method === undefined || r.method === order.paymentMethod)
        && (r.allocated === undefined || r.allocated === order.allocated)
        && (r.paid === undefined || r.paid === order.paid),
    ) ?? null
  )
}

/** Every action the actor may take on the order now, in the table's order. */
export function openActions(order: OrderFacts, actor: Actor): OrderAction[] {
  return [
    ...new Set(
      ORDER_FLOW.filter(r => findTransition(order, r.action, actor) === r).map(r => r.action),
    ),
  ]
}

/** The timeline's words for a row, with its blanks filled. */
export function flowWording(
  row: FlowRow,
  fill: { actor?: string, reason?: string, reference?: string, amount?: string },
) {
  return row.wording
    .replace('{actor}', fill.actor ?? 'Tiltwright')
    .replace('{reason}', sentence(fill.reason ?? ''))
    .replace('{reference}', fill.reference ?? '')
    .replace('{amount}', fill.amount ?? '')
}

const sentence = (s: string) => {
  const t = s.trim().replace(/[.!]+$/, '')
  return t ? `${t}.` : 'no reason given.'
}

/** A teacher's order is still theirs to cancel while it is unpaid and open. */
export const isOpenUnpaid = (status: OrderStatus) => UNPAID_OPEN.includes(status)
