// Tiltwright's own details as a seller, said once: the documents' letterhead, the invoice's
// remit-to, cheque payee, bank transfer and tax id. Every value here is INVENTED for the demo
// (the bank, its numbers and the tax id are not real and must be replaced before real use).
export const VENDOR = {
  tradingName: 'Tiltwright',
  legalName: 'Tiltwright Classroom Kits LLC',
  tagline: 'Balancing-rig kits for classrooms',
  address: '12 Lathe Row, Unit 4, Kessler Ford, OR 97998',
  email: 'orders@tiltwright.test',
  /** Invented federal employer identification number, for the demo only. */
  taxId: '00-0000000 (demo)',
  remitTo: [
    'Tiltwright Classroom Kits LLC',
    'Accounts receivable',
    'PO Box 4410',
    'Kessler Ford, OR 97998',
  ],
  chequePayee: 'Tiltwright Classroom Kits LLC',
  bank: {
    name: 'Demo Harbor Bank (invented for the demo)',
    accountName: 'Tiltwright Classroom Kits LLC',
    routingNumber: '000000000 (demo)',
    accountNumber: '0000 1234 5678 (demo)',
  },
} as const

/** The ways accounts payable can pay an invoice, one line each, the online link among them. */
export function remittanceLines(ref: {
  invoice: string
  po: string
  payUrl: string | null
}): string[] {
  const quote = `quoting invoice ${ref.invoice} and purchase order ${ref.po}`
  return [
    ...(ref.payUrl ? [`Online by card: ${ref.payUrl}`] : []),
    `Cheque payable to ${VENDOR.chequePayee}, mailed to the remit-to address; ${quote}.`,
    `Bank transfer (ACH): ${VENDOR.bank.name}, account name ${VENDOR.bank.accountName}, routing `
    + `${VENDOR.bank.routingNumber}, account ${VENDOR.bank.accountNumber}; ${quote}.`,
  ]
}
