import type { H3Event } from 'h3'
import { LRUCache } from 'lru-cache'

/**
 * Unsealed sessions by their sealed cookie. Unsealing (PBKDF2 key derivation, AES and HMAC
 * through WebCrypto) cost about a millisecond of CPU per request; a sealed cookie always
 * unseals to the same session, so the result is kept while the seal and the session are
 * within their lifetimes, and each request gets its own copy (handlers may update it).
 * Revocation does not depend on this: `requireUser` still checks the user row every time.
 */
const unsealed = new LRUCache<string, { id: string, createdAt: number, data: Record<string, unknown> }>({ max: 10_000, ttl: 10 * 60_000 })

function sessionSettings() {
  const config = useRuntimeConfig().session as { name?: string, maxAge?: number }
  return { name: config.name || 'h3', maxAgeMs: (config.maxAge ?? 0) * 1000 }
}

function sealedCookie(event: H3Event, name: string): string | undefined {
  const value = parseCookies(event)[name]
  return value && value.split('*').length === 8 ? value : undefined
}

/** Puts a known unsealed session for this request's cookie in place, so h3 need not unseal it again. */
export function reuseUnsealedSession(event: H3Event) {
  const { name, maxAgeMs } = sessionSettings()
  if (event.context.sessions?.[name]) return
  const sealed = sealedCookie(event, name)
  const hit = sealed && unsealed.get(sealed)
  if (!hit) return
  // The seal's own expiry (its sixth field) and the session's age, as h3 checks them.
  const expires = Number(sealed.split('*')[5])
  if ((expires && Date.now() >= expires) || (maxAgeMs && Date.now() - hit.createdAt > maxAgeMs)) {
    unsealed.delete(sealed)
    return
  }
  event.context.sessions ??= Object.create(null)
  event.context.sessions![name] = structuredClone(hit)
}

/** Keeps this request's session, once h3 has unsealed it, for the next request with the same cookie. */
export function rememberUnsealedSession(event: H3Event) {
  const { name } = sessionSettings()
  const session = event.context.sessions?.[name] as { id?: string, createdAt?: number, data?: Record<string, unknown> } | undefined
  const sealed = sealedCookie(event, name)
  if (!sealed || !session?.id || !session.createdAt || !session.data?.user || unsealed.has(sealed)) return
  unsealed.set(sealed, structuredClone({ id: session.id, createdAt: session.createdAt, data: session.data }))
}
