// The carriers an admin picks from when recording a shipment, and where each one's public
// tracking page is. The page addresses are the carriers' own public tracking pages as known
// from memory (checked by hand, not by a test); "other" has no link.

export const CARRIER_IDS = ['usps', 'ups', 'fedex', 'dhl', 'other'] as const
export type CarrierId = (typeof CARRIER_IDS)[number]

interface Carrier {
  id: CarrierId
  name: string
  /** The public tracking page for a tracking number, or null when there is none. */
  trackingUrl: (trackingNumber: string) => string | null
}

const q = encodeURIComponent

export const CARRIERS: readonly Carrier[] = [
  {
    id: 'usps',
    name: 'USPS',
    trackingUrl: n => `https://tools.usps.com/go/TrackConfirmAction?tLabels=${q(n)}`,
  },
  { id: 'ups', name: 'UPS', trackingUrl: n => `https://www.ups.com/track?tracknum=${q(n)}` },
  {
    id: 'fedex',
    name: 'FedEx',
    trackingUrl: n => `https://www.fedex.com/fedextrack/?trknbr=${q(n)}`,
  },
  {
    id: 'dhl',
    name: 'DHL',
    trackingUrl: n =>
      `https://www.dhl.com/us-en/home/tracking/tracking-express.html?tracking-id=${q(n)}`,
  },
  { id: 'other', name: 'Other carrier', trackingUrl: () => null },
]

export function carrierById(id: string): Carrier | undefined {
  return CARRIERS.find(c => c.id === id)
}
