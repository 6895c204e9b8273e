// The money path in the browser, as a teacher and an admin would walk it: a cart saved as a
// quote, ordered from the quote with a purchase order, approved (invoice issued), then
// cancelled by the admin with a reason after confirming; the teacher sees the invoice void and
// the simulator's invoice page refuses payment. Screenshots go to tests/.artifacts/money/.
import { writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { artifacts, gotoReady, launchForFile, signInThroughPage } from '../helpers/browser'
import { waitForMail } from '../helpers/mail'
import { PDF_BYTES, newTeacher, pdfText, productWithStock, signedIn } from '../helpers/shop'

const { dir: shots, shot } = artifacts('money')
const browser = await launchForFile()
describe('a purchase order from quote to void', () => {
  it(
    'walks a teacher and an admin from a saved quote to a cancelled order whose '
    + 'invoice is void', async () => {
      const adminApi = await signedIn('admin@tiltwright.test')
      const { productId, slug } = await productWithStock(adminApi, 40)
      const t = await newTeacher('quote-void')

      const teacher = await (
        await browser.newContext({ viewport: { width: 1366, height: 900 } })
      ).newPage()
      await signInThroughPage(teacher, t.email, 'a-long-password-1')
      await gotoReady(teacher, '/cart')
      await teacher.evaluate(
        id =>
          localStorage.setItem(
            'tiltwright-cart-v1',
            JSON.stringify([{ productId: id, quantity: 12 }]),
          ),
        productId,
      )
      await gotoReady(teacher, '/cart')
      await teacher.getByRole('button', { name: 'Save as a formal quote (PDF)' }).click()
      await teacher.waitForURL(/\/quotes\/\d+/)
      const quoteId = Number(new URL(teacher.url()).pathname.split('/').pop())
      await teacher.getByText(`Test part ${slug}`).first().waitFor()
      await shot(teacher, 'quote')
      await teacher.getByRole('link', { name: 'Order with a purchase order' }).click()
      await teacher.waitForURL(/\/checkout\?quote=\d+/)
      await teacher.getByLabel('Purchase-order number').fill('QV-2026-31')
      await teacher.getByLabel('Accounts-payable e-mail').fill('ap-quote-void@district.test')
      await teacher
        .getByLabel('Purchase-order document')
        .setInputFiles({ name: 'po.pdf', mimeType: 'application/pdf', buffer: PDF_BYTES })
      await teacher.getByRole('button', { name: 'Place the order' }).click()
      await teacher.waitForURL(/\/orders\/\d+\?placed=1/)
      const id = Number(new URL(teacher.url()).pathname.split('/').pop())

      const admin = await (
        await browser.newContext({ viewport: { width: 1366, height: 900 } })
      ).newPage()
      await signInThroughPage(admin, 'admin@tiltwright.test')
      await gotoReady(admin, `/admin/orders/${id}`)
      await admin.getByRole('button', { name: 'Approve and send the invoice' }).click()
      await admin.getByText('Approved; the invoice was issued').waitFor()
      const invoiceUrl = (await t.client.get(`/api/orders/${id}`)).body.payUrl as string
      expect(invoiceUrl).toMatch(/\/fake-pay\/invoice\//)
      await shot(admin, 'admin-approved')

      await admin.getByRole('button', { name: 'Cancel the order…' }).click()
      await admin.getByRole('button', { name: /^Yes, cancel order TW-/ }).click()
      expect(await admin.locator('#cancel-reason-error').textContent()).toMatch(/Say why/)
      await admin
        .getByLabel('Reason (the teacher and accounts payable read this)')
        .fill('The district replaced this PO with another')
      await shot(admin, 'admin-cancel-confirm')
      await admin.getByRole('button', { name: /^Yes, cancel order TW-/ }).click()
      await admin.getByText('Order cancelled: stock released, the invoice voided').waitFor()
      expect(await admin.getByTestId('order-status').first().textContent()).toBe('Cancelled')
      await shot(admin, 'admin-cancelled')

      // The void is done by a job at the payment service; the teacher's page says so once it is.
      await expect
        .poll(async () => (await t.client.get(`/api/orders/${id}`)).body.invoiceVoided, {
          timeout: 15_000,
        })
        .toBe(true)
      await gotoReady(teacher, `/orders/${id}`)
      await teacher.getByText(/is void: nothing is owed for this order/).waitFor()
      expect(await teacher.getByRole('link', { name: /Pay the invoice/ }).count()).toBe(0)
      await shot(teacher, 'teacher-void')

      await teacher.goto(invoiceUrl)
      await teacher.getByText('This invoice is void').waitFor()
      expect(await teacher.getByRole('button', { name: 'Approve this payment' }).count()).toBe(0)
      await shot(teacher, 'simulator-invoice-void')
      // The invoice PDF, kept for a person to look at: it must say VOID and not how to pay.
      const pdf = await t.client.raw(`/api/orders/${id}/documents/invoice`)
      const bytes = Buffer.from(await pdf.arrayBuffer())
      writeFileSync(resolve(shots, 'invoice-void.pdf'), bytes)
      expect(await pdfText(new Uint8Array(bytes))).toContain('This invoice is void')
      const quotePdf = await t.client.raw(`/api/quotes/${quoteId}/pdf`)
      writeFileSync(resolve(shots, 'quote.pdf'), Buffer.from(await quotePdf.arrayBuffer()))
      const mail = await waitForMail('ap-quote-void@district.test', /is void: do not pay it$/)
      expect(mail.text).toContain('QV-2026-31')
    })
})
