import { fileURLToPath } from 'node:url'
import { resolve } from 'node:path'

export const root = resolve(fileURLToPath(new URL('../..', import.meta.url)))
export const dataDir = resolve(root, process.env.BARSMITH_DATA_DIR || '.data')
export const pgDir = resolve(dataDir, 'pg')
