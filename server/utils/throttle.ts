import type { H3Event } from 'h3'
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible'

/**
 * Throttles, counted in PostgreSQL (table `rate_limits`) so every server instance shares them.
 * Limits are per 15 minutes unless said; sign-in counts only failures.
 */
const LIMITS = {
  loginEmail: { points: 5, duration: 15 * 60, blockDuration: 15 * 60 },
  loginAddress: { points: 30, duration: 15 * 60, blockDuration: 15 * 60 },
  register: { points: 10, duration: 60 * 60 },
  mailLink: { points: 5, duration: 60 * 60 },
  invite: { points: 50, duration: 60 * 60 },
  // Wrong or used reset links from one address (links are long random tokens; this stops
  // scrypt work and guessing at scale, not a person who clicks an old link twice).
  resetLink: { points: 20, duration: 15 * 60, blockDuration: 15 * 60 },
} as const

export type ThrottleName = keyof typeof LIMITS

const limiters = new Map<ThrottleName, RateLimiterPostgres>()

function limiter(name: ThrottleName): RateLimiterPostgres {
  let l = limiters.get(name)
  if (!l) {
    l = new RateLimiterPostgres({
      storeClient: usePool(),
      tableName: 'rate_limits',
      tableCreated: true,
      clearExpiredByTimeout: false,
      keyPrefix: name,
      ...LIMITS[name],
    })
    limiters.set(name, l)
  }
  return l
}

function tooMany(res: RateLimiterRes, what: string) {
  const minutes = Math.max(1, Math.ceil(res.msBeforeNext / 60000))
  return createError({
    statusCode: 429,
    message: `Too many ${what}. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
    data: { retryAfterSeconds: Math.ceil(res.msBeforeNext / 1000) },
  })
}

/** The client's address as this server saw it (no proxy headers are trusted by default). */
export function clientAddress(event: H3Event): string {
  return getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === '1' }) ?? 'unknown'
}

/** Refuses with 429 when `key` has no points left in `name`, without spending one. */
export async function assertNotThrottled(event: H3Event, name: ThrottleName, key: string, what: string) {
  const res = await limiter(name).get(key)
  if (res && res.remainingPoints <= 0) {
    setResponseHeader(event, 'Retry-After', Math.ceil(res.msBeforeNext / 1000))
    throw tooMany(res, what)
  }
}

/** Spends one point of `key` in `name`; 429 when none were left. */
export async function throttle(event: H3Event, name: ThrottleName, key: string, what: string) {
  try {
    await limiter(name).consume(key)
  }
  catch (error) {
    if (error instanceof RateLimiterRes) {
      setResponseHeader(event, 'Retry-After', Math.ceil(error.msBeforeNext / 1000))
      throw tooMany(error, what)
    }
    throw error
  }
}

/** Spends a point without refusing (a failed sign-in is counted after it failed). */
export async function countFailure(name: ThrottleName, key: string) {
  await limiter(name).penalty(key, 1)
}

export async function clearThrottle(name: ThrottleName, key: string) {
  await limiter(name).delete(key)
}
