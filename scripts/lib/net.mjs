import { createServer } from 'node:net'

/** True when nothing listens on host:port. */
export function portIsFree(port, host = '127.0.0.1') {
  return new Promise((resolvePromise) => {
    const server = createServer()
    server.once('error', () => resolvePromise(false))
    server.listen(port, host, () => server.close(() => resolvePromise(true)))
  })
}

/** The first free port at or above `start`. */
export async function findFreePort(start, host = '127.0.0.1') {
  for (let port = start; port < start + 200; port++) {
    if (await portIsFree(port, host)) return port
  }
  throw new Error(`No free port between ${start} and ${start + 199}`)
}

/** A free port chosen by the kernel. */
export function randomFreePort(host = '127.0.0.1') {
  return new Promise((resolvePromise, reject) => {
    const server = createServer()
    server.once('error', reject)
    server.listen(0, host, () => {
      const { port } = server.address()
      server.close(() => resolvePromise(port))
    })
  })
}

export async function waitForHttp(url, { timeoutMs = 60000, isAlive = () => true } = {}) {
  const deadline = Date.now() + timeoutMs
  let lastError
  while (Date.now() < deadline) {
    if (!isAlive()) throw new Error(`The process serving ${url} exited`)
    try {
      const res = await fetch(url)
      if (res.status < 500) return
      lastError = new Error(`HTTP ${res.status}`)
    }
    catch (error) { lastError = error }
    await new Promise(r => setTimeout(r, 250))
  }
  throw new Error(`${url} did not answer in ${timeoutMs} ms: ${lastError?.message}`)
}
