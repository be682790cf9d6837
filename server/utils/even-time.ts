import { setTimeout as sleep } from 'node:timers/promises'

/**
 * Waits until `minMs` have passed since `startedAt` (performance.now()). Routes that must not
 * reveal whether an address has an account (reset and confirmation links) do more work for a
 * known address; answering no sooner than a floor above that work makes both answers take
 * the same time (bench/auth-timing.bench.mjs measures the gap).
 */
export async function answerNoSoonerThan(startedAt: number, minMs: number) {
  const left = startedAt + minMs - performance.now()
  if (left > 0) await sleep(left)
}

/** The floor for the e-mail link routes: above their known-address work on a loaded laptop. */
export const MAIL_LINK_FLOOR_MS = 60

/** The floor for sign-up (a new account writes more rows than the mail to an existing one): above its scrypt hash and writes. */
export const SIGN_UP_FLOOR_MS = 250
