import pg from 'pg'
import { inject } from 'vitest'

let pool: pg.Pool | undefined

/** Raw SQL against the test database, for setup and for checks the API cannot make. */
export async function sql<T extends pg.QueryResultRow = any>(text: string, values: unknown[] = []): Promise<T[]> {
  pool ??= new pg.Pool({ connectionString: inject('databaseUrl'), max: 4 })
  const res = await pool.query<T>(text, values)
  return res.rows
}

export async function closeDb() {
  await pool?.end()
  pool = undefined
}
