// Forgetting old rows without range locks: a plain (non-locking) read finds them, and they are
// deleted by primary key (in autocommit unless `db` is the caller's own transaction, which must
// then be passed: an autocommit delete could wait on a row that transaction holds).
import { inArray, lt } from 'drizzle-orm'
import type { MySqlColumn, MySqlTable } from 'drizzle-orm/mysql-core'

export async function forgetRowsBefore(
  table: MySqlTable & { id: MySqlColumn },
  column: MySqlColumn,
  cutoff: Date,
  db: DbOrTx = useDb(),
) {
  const old = await db.select({ id: table.id }).from(table).where(lt(column, cutoff)).limit(200)
  if (old.length)
    await db.delete(table).where(
      inArray(
        table.id,
        old.map(r => r.id as number),
      ),
    )
}
