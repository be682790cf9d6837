import { ApiClient, type ApiResponse } from './http'

export interface ServerEvent { type: string, data: any, receivedAt: number }

export interface EventStreamClient {
  status: number
  events: ServerEvent[]
  /** Resolves with the first event (already received or coming) of `type` that matches. */
  next: (type: string, match?: (data: any) => boolean, timeoutMs?: number) => Promise<ServerEvent>
  /** Comments received (keep-alives). */
  comments: number
  closed: Promise<void>
  close: () => void
}

/**
 * Opens a server-sent event stream as `client` (its cookies) and parses it as it arrives
 * (event/data fields, comments), per the WHATWG HTML "server-sent events" stream format.
 */
export async function openEventStream(client: ApiClient, path: string, baseUrl = client.baseUrl): Promise<EventStreamClient> {
  const abort = new AbortController()
  const res = await fetch(new URL(path, baseUrl), {
    headers: { 'accept': 'text/event-stream', 'x-forwarded-for': client.address, ...(client.cookies.size ? { cookie: client.cookieHeader } : {}) },
    signal: abort.signal,
  })
  const events: ServerEvent[] = []
  const waiters = new Set<() => void>()
  const stream: EventStreamClient = {
    status: res.status,
    events,
    comments: 0,
    closed: Promise.resolve(),
    close: () => abort.abort(),
    next(type, match = () => true, timeoutMs = 10_000) {
      return new Promise((resolve, reject) => {
        const check = () => {
          const found = events.find(e => e.type === type && match(e.data))
          if (!found) return false
          waiters.delete(check as () => void)
          clearTimeout(timer)
          resolve(found)
          return true
        }
        const timer = setTimeout(() => {
          waiters.delete(check as () => void)
          reject(new Error(`no "${type}" event within ${timeoutMs} ms; got ${events.map(e => e.type).join(', ') || 'none'}`))
        }, timeoutMs)
        if (!check()) waiters.add(check as () => void)
      })
    },
  }
  if (res.status !== 200 || !res.body) return stream
  stream.closed = (async () => {
    const reader = res.body!.pipeThrough(new TextDecoderStream()).getReader()
    let buffer = ''
    try {
      for (;;) {
        const { value, done } = await reader.read()
        if (done) break
        buffer += value
        let cut: number
        while ((cut = buffer.indexOf('\n\n')) >= 0) {
          const block = buffer.slice(0, cut)
          buffer = buffer.slice(cut + 2)
          let type = 'message'
          const data: string[] = []
          for (const line of block.split('\n')) {
            if (line.startsWith(':')) stream.comments++
            else if (line.startsWith('event:')) type = line.slice(6).trim()
            else if (line.startsWith('data:')) data.push(line.slice(5).replace(/^ /, ''))
          }
          if (!data.length) continue
          let parsed: unknown = data.join('\n')
          try {
            parsed = JSON.parse(parsed as string)
          }
          catch { /* plain text data */ }
          events.push({ type, data: parsed, receivedAt: performance.now() })
          for (const w of [...waiters]) w()
        }
      }
    }
    catch { /* aborted */ }
  })()
  return stream
}

/**
 * A client for the role matrix that only looks at the answer's status: an event stream is
 * closed as soon as its headers arrive, an error is read whole.
 */
export class StreamProbe extends ApiClient {
  constructor(from: ApiClient) {
    super(from.baseUrl)
    this.cookies = new Map(from.cookies)
  }

  override async request<T = any>(method: string, path: string): Promise<ApiResponse<T>> {
    const abort = new AbortController()
    const res = await fetch(new URL(path, this.baseUrl), {
      method,
      headers: { 'x-forwarded-for': this.address, ...(this.cookies.size ? { cookie: this.cookieHeader } : {}) },
      signal: abort.signal,
    })
    if ((res.headers.get('content-type') ?? '').startsWith('text/event-stream')) {
      abort.abort()
      return { status: res.status, body: undefined as T, headers: res.headers, text: '' }
    }
    const text = await res.text()
    let body: any = text
    try {
      body = JSON.parse(text)
    }
    catch { /* left as text */ }
    return { status: res.status, body, headers: res.headers, text }
  }
}
