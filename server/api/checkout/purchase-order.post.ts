// Purchase-order checkout (multipart): the PO number and document, the accounts-payable
// contact, optionally the school's tax-exemption certificate. The order waits in `po review`.
import type { MultiPartData } from 'h3'
import { checkoutSourceSchema, purchaseOrderFieldsSchema } from '../../../shared/schemas/shop'
import { checkoutAddressesSchema } from '../../../shared/schemas/address'
import { fieldErrorsOf } from '../../../shared/utils/field-errors'
import { removeStoredFile, safeFilename, storeFile, uploadProblem } from '../../services/files'
import type { PurchaseOrderCheckoutReply } from '../../../shared/types/shop'

const text = (parts: MultiPartData[], name: string) => {
  const p = parts.find(x => x.name === name && !x.filename)
  return p ? p.data.toString('utf8') : undefined
}
const prefixed = (prefix: string, f: Record<string, string>) =>
  Object.fromEntries(Object.entries(f).map(([k, v]) => [`${prefix}.${k}`, v]))
const file = (parts: MultiPartData[], name: string) =>
  parts.find(x => x.name === name && x.filename !== undefined)

export default defineEventHandler(async (event): Promise<PurchaseOrderCheckoutReply> => {
  const user = await requireRole(event, 'teacher')
  assertMayOrder(user)
  let parts: MultiPartData[] | undefined
  try {
    parts = await readMultipartParts(event)
  } catch {
    throw badRequest('The form could not be read. Send it as multipart/form-data.', 'bad-multipart')
  }
  if (!parts)
    throw invalid(
      { poFile: 'Attach the purchase order (PDF, PNG, JPEG or WebP).' },
      'Send the purchase-order form as multipart/form-data.',
    )

  const fields: Record<string, string> = {}
  let lines: unknown
  const rawLines = text(parts, 'lines')
  if (rawLines !== undefined) {
    try {
      lines = JSON.parse(rawLines)
    } catch {
      fields.lines = 'The cart lines are not valid JSON.'
    }
  }
  const rawQuote = text(parts, 'quoteId')
  const source = checkoutSourceSchema.safeParse(rawQuote ? { quoteId: rawQuote } : { lines })
  if (!source.success && !fields.lines) Object.assign(fields, fieldErrorsOf(source.error))
  const po = purchaseOrderFieldsSchema.safeParse({
    poNumber: text(parts, 'poNumber'),
    apEmail: text(parts, 'apEmail'),
  })
  if (!po.success) Object.assign(fields, fieldErrorsOf(po.error))
  // Ship-to, bill-to and delivery note (JSON, as the card checkout sends them); the school's
  // address when absent.
  const rawAddresses = text(parts, 'addresses')
  let addresses: unknown
  if (rawAddresses !== undefined) {
    try {
      addresses = JSON.parse(rawAddresses)
    } catch {
      fields.addresses = 'The addresses are not valid JSON.'
    }
  }
  const where = addresses === undefined ? null : checkoutAddressesSchema.safeParse(addresses)
  if (where && !where.success)
    Object.assign(fields, prefixed('addresses', fieldErrorsOf(where.error)))
  const poFile = file(parts, 'poFile')
  const poCheck = await uploadProblem(poFile, 'purchase order')
  if ('problem' in poCheck) fields.poFile = poCheck.problem
  const certFile = file(parts, 'taxCertificate')
  const certCheck
    = certFile && certFile.data.length
      ? await uploadProblem(certFile, 'tax-exemption certificate')
      : null
  if (certCheck && 'problem' in certCheck) fields.taxCertificate = certCheck.problem
  if (Object.keys(fields).length || !source.success || !po.success || !('mime' in poCheck))
    throw invalid(fields)

  const stored: StoredUpload[] = []
  stored.push({
    kind: 'purchase-order',
    key: await storeFile('po', poFile!.data),
    filename: safeFilename(poFile!.filename, poCheck.mime, `PO-${po.data.poNumber}`),
    mime: poCheck.mime,
    size: poFile!.data.length,
  })
  if (certCheck && 'mime' in certCheck)
    stored.push({
      kind: 'tax-certificate',
      key: await storeFile('tax', certFile!.data),
      filename: safeFilename(certFile!.filename, certCheck.mime, 'tax-exemption-certificate'),
      mime: certCheck.mime,
      size: certFile!.data.length,
    })

  try {
    const placed = await placePurchaseOrder(
      user,
      { ...source.data, addresses: where?.data },
      po.data,
      stored,
    )
    setResponseStatus(event, 201)
    return { orderId: placed.id, number: placed.number }
  } catch (e) {
    await Promise.all(stored.map(s => removeStoredFile(s.key).catch(() => {})))
    throw e
  }
})
