// The fake's objects live in MariaDB (table fake_payment_objects), one JSON document each,
// so they survive a restart of the app like the provider's would.
import { randomBytes } from 'node:crypto'
import { and, desc, eq } from 'drizzle-orm'
import { fakePaymentObjects } from '../database/schema'
import { useDb } from '../utils/db'

export type FakeObject = Record<string, any> & { id: string, object: string }

export const newId = (prefix: string) => `${prefix}_${randomBytes(12).toString('hex')}`
export const nowSeconds = () => Math.floor(Date.now() / 1000)

export async function putObject(obj: FakeObject) {
  await useDb()
    .insert(fakePaymentObjects)
    .values({ id: obj.id, type: obj.object, data: obj })
    .onDuplicateKeyUpdate({ set: { data: obj } })
  return obj
}

export async function getObject(type: string, id: string): Promise<FakeObject | undefined> {
  const [row] = await useDb()
    .select()
    .from(fakePaymentObjects)
    .where(and(eq(fakePaymentObjects.id, id), eq(fakePaymentObjects.type, type)))
    .limit(1)
  return row?.data as FakeObject | undefined
}

export async function listObjects(type: string, limit: number): Promise<FakeObject[]> {
  const rows = await useDb()
    .select()
    .from(fakePaymentObjects)
    .where(eq(fakePaymentObjects.type, type))
    .orderBy(desc(fakePaymentObjects.createdAt), desc(fakePaymentObjects.id))
    .limit(limit)
  return rows.map(r => r.data as FakeObject)
}

/** What the provider would show of an object: internal fields start with an underscore. */
export function publicView(obj: FakeObject): FakeObject {
  return Object.fromEntries(Object.entries(obj).filter(([k]) => !k.startsWith('_'))) as FakeObject
}
