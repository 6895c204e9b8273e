// The one MariaDB pool of the server process and its Drizzle handle.
import { drizzle } from 'drizzle-orm/mysql2'
import mysql from 'mysql2/promise'
import * as schema from '../database/schema'

let pool: mysql.Pool | undefined
let db: ReturnType<typeof makeDb> | undefined

function makeDb(p: mysql.Pool) {
  return drizzle(p, { schema, mode: 'default' })
}

export type Db = ReturnType<typeof makeDb>
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0]
export type DbOrTx = Db | Tx

export function useDb(): Db {
  if (!db) {
    pool = mysql.createPool({
      uri: useRuntimeConfig().databaseUrl,
      connectionLimit: 20,
      timezone: 'Z',
      dateStrings: false,
      supportBigNumbers: true,
    })
    db = makeDb(pool)
  }
  return db
}

export async function closeDb() {
  const p = pool
  pool = undefined
  db = undefined
  await p?.end()
}

export { schema }
