import { readdir, readFile } from 'node:fs/promises'
import { resolve } from 'node:path'

/** Messages the local fake SMTP server stored, newest first (dev builds only). */
export async function readMailbox(): Promise<Array<Record<string, unknown>>> {
  const dir = useEnv().MAILBOX_DIR
  if (!dir) return []
  const files = (await readdir(dir).catch(() => [] as string[])).filter(f => f.endsWith('.json')).sort().reverse()
  return Promise.all(files.slice(0, 200).map(async f => JSON.parse(await readFile(resolve(dir, f), 'utf8'))))
}
