// Demo data: an invented scenario (Cobalt Hills School District, Wrenfield Middle School
// and its people). Every demo account's password is `tiltwright-demo`.
import mysql from 'mysql2/promise'
import { drizzle } from 'drizzle-orm/mysql2'
import { count } from 'drizzle-orm'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import * as schema from '../server/database/schema'
import { DEMO_CATALOG } from './demo-catalog'
import { seedDemoBuild } from './demo-build'
import { seedDemoTickets } from './demo-tickets'

export const DEMO_PASSWORD = 'tiltwright-demo'

export const DEMO_ACCOUNTS = [
  { email: 'teacher@tiltwright.test', name: 'Dana Ferrow', role: 'teacher' },
  { email: 'builder@tiltwright.test', name: 'Jonah Pell', role: 'builder' },
  { email: 'support@tiltwright.test', name: 'Ruth Okafor-Lane', role: 'support' },
  { email: 'admin@tiltwright.test', name: 'Marcus Teel', role: 'admin' },
] as const

/**
 * Seeds the demo scenario into what is empty: the school and its people when there are no users,
 * the catalog when there are no products (so a data folder from before the shop still gets
 * one). With the people come the teacher's paid order and its build space (scripts/demo-build.ts)
 * and tickets on it (scripts/demo-tickets.ts).
 * The demo tickets' files go to `uploadDir` (the app's `uploads` storage; by default where
 * nuxt.config.ts puts it). Returns what it seeded.
 */
export async function seedDemo(
  url: string,
  opts: { uploadDir?: string } = {},
): Promise<{ people: boolean, catalog: boolean }> {
  const conn = await mysql.createConnection({ uri: url })
  try {
    const db = drizzle(conn, { schema, mode: 'default' })
    const [people] = await db.select({ n: count() }).from(schema.users)
    const [products] = await db.select({ n: count() }).from(schema.products)
    const seeded = { people: !people?.n, catalog: !products?.n }
    // The same scrypt driver and defaults that nuxt-auth-utils' hashPassword uses.
    const passwordHash = seeded.people ? await new Hash(new Scrypt({})).make(DEMO_PASSWORD) : ''
    await db.transaction(async (tx) => {
      const people = new Map<string, { id: number, name: string }>()
      let schoolId = 0
      if (seeded.people) {
        const [school] = await tx
          .insert(schema.schools)
          .values({
            name: 'Wrenfield Middle School',
            district: 'Cobalt Hills School District',
            addressLine1: '48 Orchard Terrace',
            city: 'Bramley Falls',
            region: 'OR',
            postalCode: '97999',
            country: 'US',
            taxExemption: 'accepted',
          })
          .$returningId()
        schoolId = school!.id
        for (const a of DEMO_ACCOUNTS) {
          const customer = a.role === 'teacher' || a.role === 'builder'
          const [user] = await tx
            .insert(schema.users)
            .values({
              ...a,
              passwordHash,
              schoolId: customer ? school!.id : null,
              verifiedAt: new Date(),
            })
            .$returningId()
          people.set(a.role, { id: user!.id, name: a.name })
        }
      }
      if (seeded.catalog) {
        for (const [i, p] of DEMO_CATALOG.entries()) {
          const { tiers, batches, ...product } = p
          const [row] = await tx
            .insert(schema.products)
            .values({ ...product, sortOrder: i })
            .$returningId()
          await tx
            .insert(schema.priceTiers)
            .values(
              tiers.map(([minQuantity, unitPriceCents]) => ({
                productId: row!.id,
                minQuantity,
                unitPriceCents,
              })),
            )
          await tx
            .insert(schema.batches)
            .values(
              batches.map(([code, quantityBuilt, builtOn]) => ({
                productId: row!.id,
                code,
                quantityBuilt,
                builtOn: new Date(`${builtOn}T12:00:00Z`),
              })),
            )
        }
      }
      if (seeded.people) {
        const space = await seedDemoBuild(tx, {
          schoolId,
          teacher: people.get('teacher')!,
          builder: people.get('builder')!,
          passwordHash,
        })
        if (space)
          await seedDemoTickets(tx, space, {
            teacher: people.get('teacher')!,
            builder: people.get('builder')!,
            support: people.get('support')!,
            admin: people.get('admin')!,
          }, opts.uploadDir)
      }
    })
    return seeded
  } finally {
    await conn.end()
  }
}
