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
