import { ensureDebianPackages, ensureNodeModules, postgresPackage, chromiumPackage, fixtureToolPackages } from './deps.mjs'
import { ensureDatabase, startCluster } from './pg.mjs'
import { pgDir } from './paths.mjs'
import { localSecrets } from './secrets.mjs'
import { step } from './log.mjs'

/**
 * What both `npm start` and `npm test` need first: packages, the local cluster, a database.
 * Returns the connection URL, the secrets and the cluster handle.
 */
export async function prepare({ database, fresh = false, forTests = false }) {
  await ensureNodeModules()
  await ensureDebianPackages([postgresPackage, ...(forTests ? [chromiumPackage, ...fixtureToolPackages] : [])])
  const secrets = localSecrets()
  const cluster = await startCluster(pgDir)
  const databaseUrl = await ensureDatabase(pgDir, cluster.port, database, { password: secrets.dbPassword, fresh })
  step(`database ${database} ready${fresh ? ' (fresh)' : ''}`)
  return { cluster, databaseUrl, secrets }
}
