import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import * as schema from '../database/schema'

export type Db = NodePgDatabase<typeof schema>
/** A Drizzle transaction or the database itself: helpers accept either. */
export type DbOrTx = Db | Parameters<Parameters<Db['transaction']>[0]>[0]

let pool: pg.Pool | undefined
let db: Db | undefined

export function usePool(): pg.Pool {
  if (!pool) {
    const env = useEnv()
    pool = new pg.Pool({
      connectionString: env.DATABASE_URL,
      max: env.DATABASE_POOL_MAX,
      connectionTimeoutMillis: 5000,
      idleTimeoutMillis: 30000,
    })
    // An idle client losing its connection (database restart) must not crash the process.
    pool.on('error', error => console.warn('[db] idle client error:', error.message))
  }
  return pool
}

/** The app's Drizzle instance over one pool per process. */
export function useDb(): Db {
  if (!db) db = drizzle(usePool(), { schema, casing: 'snake_case' })
  return db
}

export { schema as tables }
