import { readdirSync, statSync } from 'node:fs'
import { resolve } from 'node:path'

export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE'

/** Every API route as `METHOD /api/path/[param]`, read from the server/api file tree. */
export function discoverRoutes(root = resolve(process.cwd(), 'server/api')): string[] {
  const out: string[] = []
  const walk = (dir: string, prefix: string) => {
    for (const name of readdirSync(dir).sort()) {
      const full = resolve(dir, name)
      if (statSync(full).isDirectory()) {
        walk(full, `${prefix}/${name}`)
        continue
      }
      const m = name.match(/^(.*)\.(get|post|put|patch|delete)\.ts$/)
      if (!m) throw new Error(`server/api file without a verb in its name: ${prefix}/${name}`)
      const path = m[1] === 'index' ? prefix : `${prefix}/${m[1]}`
      out.push(`${m[2]!.toUpperCase()} /api${path}`)
    }
  }
  walk(root, '')
  return out
}

/** Fills `[param]` segments of a route with values. */
export function fillRoute(route: string, params: Record<string, string> = {}): string {
  return route.replace(/\[(\w+)\]/g, (_, name: string) => {
    const v = params[name]
    if (v === undefined) throw new Error(`no value for [${name}] in ${route}`)
    return encodeURIComponent(v)
  })
}
