// A shipment as the order pages show it: the carrier's name and its public tracking page.
// Shipments recorded before carriers were a fixed list keep their free text and get no link.
import { carrierById, type CarrierId } from './carriers'

export interface ShipmentCarrier {
  /** A carrier id, or an older shipment's free text. */
  carrier: CarrierId | string
  carrierName: string
  trackingUrl: string | null
}

export function shipmentCarrier(carrier: string, tracking: string): ShipmentCarrier {
  const known = carrierById(carrier)
  return {
    carrier,
    carrierName: known?.name ?? carrier,
    trackingUrl: known ? known.trackingUrl(tracking) : null,
  }
}

/** The timeline's reference for replacement parts sent from a ticket ("Lever Arm × 1 for ticket
 *  T-3; USPS, tracking 9400…"): the order engine and the demo data write the same words. */
export function replacementReference(
  parts: readonly { name: string, quantity: number }[],
  ticket: string,
  carrier: string,
  tracking: string,
): string {
  const what = parts.map(p => `${p.name} × ${p.quantity}`).join(', ')
  return `${what} for ticket ${ticket}; ${shipmentCarrier(carrier, tracking).carrierName}, `
    + `tracking ${tracking}`
}
