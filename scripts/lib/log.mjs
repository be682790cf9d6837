const started = Date.now()

/** Prints one step of a script with the seconds since the script started. */
export function step(message) {
  const s = ((Date.now() - started) / 1000).toFixed(1).padStart(5)
  console.log(`[barsmith ${s}s] ${message}`)
}

export function fail(message) {
  console.error(`\n[barsmith] ${message}\n`)
  process.exit(1)
}
