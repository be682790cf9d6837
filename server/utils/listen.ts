import pg from 'pg'

type Handler = (payload: string) => void

const handlers = new Map<string, Set<Handler>>()
const reconnectHandlers = new Set<() => void>()
let everConnected = false
let client: pg.Client | undefined
let connecting: Promise<void> | undefined
let retryTimer: ReturnType<typeof setTimeout> | undefined
let closed = false

function scheduleReconnect() {
  if (closed || retryTimer) return
  client = undefined
  retryTimer = setTimeout(() => {
    retryTimer = undefined
    void connect()
  }, 2000)
}

async function connect(): Promise<void> {
  if (closed || client) return
  connecting ??= (async () => {
    const c = new pg.Client({ connectionString: useEnv().DATABASE_URL })
    c.on('error', () => scheduleReconnect())
    c.on('end', () => scheduleReconnect())
    c.on('notification', (n) => {
      for (const h of handlers.get(n.channel) ?? []) h(n.payload ?? '')
    })
    try {
      await c.connect()
      for (const channel of handlers.keys()) await c.query(`LISTEN "${channel}"`)
      client = c
      // Notifications sent while the connection was down are lost: let caches start over.
      if (everConnected) for (const h of reconnectHandlers) h()
      everConnected = true
    }
    catch {
      await c.end().catch(() => {})
      scheduleReconnect()
    }
  })().finally(() => { connecting = undefined })
  return connecting
}

/**
 * Subscribes to a PostgreSQL NOTIFY channel over one dedicated connection per process,
 * re-listening after the database comes back. Returns the unsubscribe function.
 */
export async function listenTo(channel: string, handler: Handler): Promise<() => void> {
  if (!/^\w+$/.test(channel)) throw new Error(`bad channel name ${channel}`)
  let set = handlers.get(channel)
  if (!set) {
    set = new Set()
    handlers.set(channel, set)
    if (client) await client.query(`LISTEN "${channel}"`).catch(() => scheduleReconnect())
  }
  set.add(handler)
  await connect()
  return () => {
    set.delete(handler)
  }
}

/** Runs `fn` whenever the LISTEN connection comes back after a loss (notifications may be missed). */
export function onListenerReconnect(fn: () => void): () => void {
  reconnectHandlers.add(fn)
  return () => {
    reconnectHandlers.delete(fn)
  }
}

export async function closeListener() {
  closed = true
  if (retryTimer) clearTimeout(retryTimer)
  await client?.end().catch(() => {})
}
