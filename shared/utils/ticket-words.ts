// How the ticket pages name what a ticket is about.
import type { TicketSummary } from '../types/tickets'

/** A rig by its name, with its serial when the teacher named it: "Tall Tower (TW-10001-03)". */
export function rigLabel(rig: { name: string, serial: string }): string {
  return rig.name === rig.serial ? rig.serial : `${rig.name} (${rig.serial})`
}

/** "Rig Tall Tower (TW-10001-03)" or "Order TW-10001". */
export function ticketAbout(t: Pick<TicketSummary, 'rig' | 'order'>): string {
  return t.rig ? `Rig ${rigLabel(t.rig)}` : `Order ${t.order.number}`
}
