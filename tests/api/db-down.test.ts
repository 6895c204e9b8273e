// While MariaDB is down the API answers 503 with a retry hint and pages say Tiltwright is
// briefly unavailable (not "nothing here"); when it is back, so is everything else.
import { afterAll, describe, expect, it } from 'vitest'
import { ping, shutdown, startMariaDb } from '../../scripts/lib/mariadb'
import { Client } from '../helpers/client'
import { testDatabase } from '../setup/slot'

async function backUp() {
  if (!ping(testDatabase())) await startMariaDb(testDatabase())
  // The pool drops its dead connections on first use; wait until answers are steady again.
  let good = 0
  for (let i = 0; i < 100 && good < 3; i++) {
    good = (await new Client().get('/api/products')).status === 200 ? good + 1 : 0
    if (good < 3) await new Promise(r => setTimeout(r, 200))
  }
  expect(good).toBe(3)
}

afterAll(backUp)

describe('when the database is down', () => {
  it(
    'answers 503 with Retry-After on the API and a "briefly unavailable" page, '
    + 'then recovers', async () => {
      const slug = (await new Client().get('/api/products')).body.data[0].slug
      const signedIn = new Client()
      await signedIn.signIn('teacher@tiltwright.test')
      shutdown(testDatabase())
      expect(ping(testDatabase())).toBe(false)

      const api = await new Client().get('/api/products')
      expect(api.status).toBe(503)
      expect(api.body.data).toMatchObject({ code: 'unavailable' })
      expect(Number(api.headers.get('retry-after'))).toBeGreaterThan(0)
      expect((await signedIn.get('/api/account')).status).toBe(503)

      const page = await new Client().raw(`/kits/${slug}`)
      expect(page.status).toBe(503)
      const html = await page.text()
      expect(html).toContain('Tiltwright is briefly unavailable')
      expect(html).not.toContain('There is nothing here')

      await backUp()
      expect((await signedIn.get('/api/account')).status).toBe(200)
    })
})
