import { randomBytes } from 'node:crypto'
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { dataDir } from './paths.mjs'

/**
 * Local secrets (session password, database password), generated once and kept under .data/
 * so sessions and the cluster survive restarts. Real deployments set them in the environment.
 */
export function localSecrets() {
  const file = resolve(dataDir, 'secrets.json')
  if (existsSync(file)) return JSON.parse(readFileSync(file, 'utf8'))
  mkdirSync(dataDir, { recursive: true })
  const secrets = {
    sessionPassword: randomBytes(32).toString('base64url'),
    dbPassword: randomBytes(18).toString('base64url'),
  }
  writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 })
  return secrets
}
