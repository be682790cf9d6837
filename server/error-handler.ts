import type { H3Error, H3Event } from 'h3'

interface PgLikeError { code?: string, message?: string, constraint?: string, errno?: number }

function causes(error: unknown): PgLikeError[] {
  const out: PgLikeError[] = []
  let e = error as { cause?: unknown } | undefined
  for (let depth = 0; e && depth < 6; depth++) {
    out.push(e as PgLikeError)
    e = e.cause as typeof e
  }
  return out
}

const CONNECTION_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', '57P01', '57P02', '57P03', '53300'])

/** Maps an error to the status and message a person can act on; null leaves it as it is. */
export function classify(error: unknown): { statusCode: number, message: string } | null {
  for (const c of causes(error)) {
    if (c.code && (CONNECTION_CODES.has(c.code) || c.code.startsWith('08'))) {
      return { statusCode: 503, message: 'The database is not reachable right now. Nothing was changed; try again in a moment.' }
    }
    if (/Connection terminated|timeout exceeded when trying to connect|Client has encountered a connection error/i.test(c.message ?? '')) {
      return { statusCode: 503, message: 'The database is not reachable right now. Nothing was changed; try again in a moment.' }
    }
    // Raised by Barsmith's own triggers (sealed versions, split totals): the message is for people.
    if (c.code === 'P0001') return { statusCode: 409, message: c.message ?? 'Refused by the database.' }
    if (c.code === '22P02' || c.code === '22003' || c.code === '22001') return { statusCode: 400, message: 'A value in the request has the wrong form or size.' }
    if (c.code === '23505') return { statusCode: 409, message: 'That already exists.' }
    if (c.code === '23503') return { statusCode: 409, message: 'That refers to something that no longer exists.' }
    if (c.code === '23P01') return { statusCode: 409, message: c.constraint === 'sections_no_overlap' ? 'Those bars already belong to another section. Sections may not overlap.' : 'That overlaps with something that already exists.' }
    if (c.code === '23514') return { statusCode: 400, message: `The values break a rule (${c.constraint ?? 'check'}).` }
  }
  return null
}

function wantsJson(event: H3Event): boolean {
  return event.path.startsWith('/api/') || (getRequestHeader(event, 'accept') ?? '').includes('application/json')
}

/**
 * API errors are always JSON `{ statusCode, message }`; database outages become 503 and
 * unexpected failures a 500 without internals. Pages fall through to Nuxt's error page.
 */
export default async function barsmithErrorHandler(error: H3Error, event: H3Event) {
  if (!wantsJson(event)) return
  const mapped = classify(error)
  let statusCode = mapped?.statusCode ?? error.statusCode ?? 500
  let message = mapped?.message ?? error.message
  if (statusCode >= 500 && !mapped) {
    console.error('[barsmith]', event.method, event.path, error.cause ?? error)
    statusCode = 500
    message = 'Something went wrong on our side. Nothing you sent was lost; try again, and tell us if it keeps happening.'
  }
  if (statusCode === 503) setResponseHeader(event, 'Retry-After', 5)
  setResponseStatus(event, statusCode)
  setResponseHeader(event, 'Content-Type', 'application/json')
  setResponseHeader(event, 'Cache-Control', 'no-store')
  const body: Record<string, unknown> = { statusCode, message }
  if (error.data !== undefined && !mapped && statusCode < 500) body.data = error.data
  return send(event, JSON.stringify(body))
}
