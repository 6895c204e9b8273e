// Forgetting old counter rows without range locks: a plain (non-locking) read finds them, and
// they are deleted by primary key in autocommit, so a request's own transaction never waits on it.
import { inArray, lt } from 'drizzle-orm'
import type { MySqlColumn, MySqlTable } from 'drizzle-orm/mysql-core'

export async function forgetRowsBefore(table: MySqlTable & { id: MySqlColumn }, column: MySqlColumn, cutoff: Date) {
  const db = useDb()
  const old = await db.select({ id: table.id }).from(table).where(lt(column, cutoff)).limit(200)
  if (old.length) await db.delete(table).where(inArray(table.id, old.map((r) => r.id as number)))
}
