import { existsSync } from 'node:fs'
import { dirname, resolve } from 'node:path'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import pg from 'pg'

/** `drizzle/` beside the built server (copied there at build time), else in the project. */
export function migrationsFolder(): string {
  const candidates = [
    process.env.MIGRATIONS_DIR,
    process.argv[1] ? resolve(dirname(process.argv[1]), 'drizzle') : undefined,
    resolve(process.cwd(), 'drizzle'),
  ].filter((c): c is string => !!c)
  const found = candidates.find(c => existsSync(resolve(c, 'meta/_journal.json')))
  if (!found) throw new Error(`No Drizzle migrations found (looked in ${candidates.join(', ')})`)
  return found
}

// Any constant will do: it only has to be the same in every instance.
const MIGRATION_LOCK = 7_041_993

/**
 * Applies pending migrations under an advisory lock, so several instances starting at once
 * migrate one after the other.
 */
export async function runMigrations(connectionString: string): Promise<void> {
  const client = new pg.Client({ connectionString })
  await client.connect()
  try {
    await client.query('SELECT pg_advisory_lock($1)', [MIGRATION_LOCK])
    await migrate(drizzle(client), { migrationsFolder: migrationsFolder() })
  }
  finally {
    await client.query('SELECT pg_advisory_unlock($1)', [MIGRATION_LOCK]).catch(() => {})
    await client.end()
  }
}
