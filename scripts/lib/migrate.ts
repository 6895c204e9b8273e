// Applies the committed drizzle-kit migrations with drizzle-orm's own migrator (it reports
// the real SQL error, where `drizzle-kit migrate` exits 1 silently).
import { resolve } from 'node:path'
import mysql from 'mysql2/promise'
import { drizzle } from 'drizzle-orm/mysql2'
import { migrate } from 'drizzle-orm/mysql2/migrator'
import { projectRoot } from './mariadb'

export async function migrateDatabase(url: string) {
  const conn = await mysql.createConnection({ uri: url, multipleStatements: true })
  try {
    await migrate(drizzle(conn), {
      migrationsFolder: resolve(projectRoot, 'server/database/migrations'),
    })
  } finally {
    await conn.end()
  }
}
