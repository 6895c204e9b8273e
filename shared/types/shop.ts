// What the shop's routes answer; the pages type their useFetch calls with these.
import type { PriceTier, PricedLine, Totals } from '../utils/pricing'
import type { ListReply } from '../schemas/list'
import type { OrderAction, OrderStatus, PaymentMethod } from '../utils/order-flow'
import type { CheckoutAddresses } from '../schemas/address'
import type { WayBack } from '../utils/resubmit'
import type { ShipmentCarrier } from '../utils/shipments'
import type {
  OrderDocumentKind,
  ShipmentKind,
  PoStatus,
  ProductKind,
  ReservationStatus,
  UploadKind,
} from '../utils/states'

export interface BatchView {
  id: number
  code: string
  quantityBuilt: number
  left: number
  builtOn: string
}

export interface ProductView {
  id: number
  slug: string
  name: string
  kind: ProductKind
  summary: string
  image: string
  priceTiers: PriceTier[]
  available: number
  batches: BatchView[]
  active: boolean
}

export interface ProductDetail extends ProductView {
  description: string
  specs: { label: string, value: string }[]
  weightGrams: number
}

export interface PricedCartLine extends PricedLine {
  slug: string
  image: string
  available: number
  short: boolean
  /** The tier's quantity range as the kit page shows it, "1–4" or "12+" (tierRangeLabel). */
  tierLabel: string
}

export interface PricedCart extends Totals {
  lines: PricedCartLine[]
  /** Lines dropped because the product is gone or no longer sold. */
  missing: number[]
  signedIn: boolean
}

export interface DocLine {
  name: string
  quantity: number
  tierMinQuantity: number
  unitPriceCents: number
  lineTotalCents: number
  productId: number
  /** The tier's range as the kit page shows it ("1–4", "12+"), kept with the line. */
  tierLabel?: string | null
}

export interface QuoteView extends Totals {
  id: number
  number: string
  createdAt: string
  validUntil: string
  valid: boolean
  orderId: number | null
  school: { name: string }
  /** The school's exemption was accepted after this quote: an order from it pays no sales tax. */
  exemptNow: boolean
  lines: DocLine[]
}

export interface OrderEventView {
  id: number
  kind: string
  message: string
  createdAt: string
}
export interface ShipmentView extends ShipmentCarrier {
  id: number
  tracking: string
  shippedAt: string
  /** The order's goods, or free replacement parts sent from a ticket. */
  kind: ShipmentKind
  /** A replacement's parts (empty for the order's own shipment, which carries its lines). */
  items: { name: string, quantity: number }[]
  /** The ticket a replacement answered; null for the order's own shipment. */
  ticketId: number | null
}
export interface OrderDocument {
  kind: 'quote' | OrderDocumentKind | UploadKind
  label: string
  url: string
}

export interface OrderView {
  id: number
  number: string
  status: OrderStatus
  paymentMethod: PaymentMethod
  subtotalCents: number
  shippingCents: number
  taxCents: number
  totalCents: number
  taxExempt: boolean
  taxRateBasisPoints: number
  taxState: string | null
  /** The ship-to, bill-to and delivery note the order was placed with. */
  addresses: CheckoutAddresses
  createdAt: string
  paidAt: string | null
  school: { id: number, name: string, district: string | null, taxExemption: string }
  placedBy: { name: string, email: string }
  quoteId: number | null
  lines: DocLine[]
  events: OrderEventView[]
  shipments: ShipmentView[]
  documents: OrderDocument[]
  payUrl: string | null
  invoice: { number: string | null, dueAt: string | null } | null
  purchaseOrder: {
    poNumber: string
    apEmail: string
    status: PoStatus
    rejectReason: string | null
  } | null
  reservations: {
    batchCode: string
    productName: string
    quantity: number
    status: ReservationStatus
  }[]
  allocated: boolean
  canCancel: boolean
  /** The admin's open steps, from the order flow's table. */
  actions: OrderAction[]
  /** The order's build space (/orders/:id/build): open once paid or its purchase order is
   *  approved (with a rig per kit unit), not open before, null for an order without kits. */
  buildSpace: { open: boolean, rigs: number } | null
  refundedAt: string | null
  invoiceVoided: boolean
  /** A word for the admin after a step, e.g. that the invoice will follow. */
  notice?: string | null
  /** After a refused purchase order: the one way to order the same again (for its teacher). */
  wayBack: WayBack | null
}

/** An order as support see it (GET /api/orders/[id]): no totals, no line prices, and the
 *  timeline's amounts taken out (shared/utils/unpriced.ts). */
export interface UnpricedOrderView
  extends Omit<OrderView, 'subtotalCents' | 'shippingCents' | 'taxCents' | 'totalCents' | 'lines'> {
  pricesHidden: true
  lines: { productId: number, name: string, quantity: number, tierLabel: string | null }[]
}
/** GET /api/orders/[id]: the full view, or support's view without money. */
export type OrderReply = OrderView | UnpricedOrderView

/** What every admin order step (/api/admin/orders/[id]/*) answers: the refreshed order, and a
 *  word for the admin when part of the step is still under way (null otherwise). */
export interface AdminOrderReply extends OrderView {
  notice: string | null
}

export interface OrderSummary {
  id: number
  number: string
  status: OrderStatus
  paymentMethod: PaymentMethod
  totalCents: number
  createdAt: string
  school: string
  poNumber: string | null
  paid: boolean
}

/** GET /api/admin/orders. */
export type AdminOrderListReply = ListReply<OrderSummary>
/** GET /api/orders: the teacher's school's orders. */
export interface OrderListReply {
  data: OrderSummary[]
}

/** GET /api/products: the public catalog (without prices for a builder). */
export interface CatalogReply {
  data: ProductView[]
}
/** GET /api/admin/products: every product, withdrawn ones included. */
export interface AdminCatalogReply {
  data: ProductDetail[]
}

/** A production batch in the admin's batch table. */
export interface BatchRow {
  id: number
  productId: number
  product: string
  slug: string
  code: string
  quantityBuilt: number
  reserved: number
  left: number
  builtOn: string
}
export interface BatchListReply {
  data: BatchRow[]
}
/** PATCH /api/admin/batches/[id]: the recounted batch. */
export interface BatchRecountReply {
  id: number
  quantityBuilt: number
  reserved: number
  left: number
}

/** POST /api/checkout/card: the order and the payment page to send the teacher to. */
export interface CardCheckoutReply {
  orderId: number
  number: string
  url: string | null
}
/** POST /api/checkout/purchase-order. */
export interface PurchaseOrderCheckoutReply {
  orderId: number
  number: string
}

/** A quote in the teacher's list. */
export interface QuoteSummary {
  id: number
  number: string
  createdAt: string
  validUntil: string
  totalCents: number
  orderId: number | null
  valid: boolean
}
export interface QuoteListReply {
  data: QuoteSummary[]
}
/** POST /api/quotes (201). */
export interface QuoteCreatedReply {
  id: number
  number: string
  totalCents: number
  validUntil: string
}

/** POST /api/webhooks/payments: the provider only reads the status. */
export interface WebhookReply {
  received: true
  duplicate: boolean
}
