import { randomBytes } from 'node:crypto'
import { inject } from 'vitest'

export interface ApiResponse<T = any> {
  status: number
  body: T
  headers: Headers
  text: string
}

/** A random documentation-range address (RFC 5737), so each client is throttled on its own. */
export function randomAddress(): string {
  const b = randomBytes(2)
  return `198.51.${b[0]}.${b[1]! % 254 + 1}`
}

/**
 * An HTTP client for the running test server with its own cookie jar, like one browser.
 * Requests resolve with status and parsed body; they never throw on 4xx/5xx.
 */
export class ApiClient {
  cookies = new Map<string, string>()
  readonly address = randomAddress()
  constructor(readonly baseUrl = inject('baseUrl')) {}

  get cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
  }

  async request<T = any>(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<ApiResponse<T>> {
    const init: RequestInit = {
      method,
      headers: {
        'x-forwarded-for': this.address,
        ...(this.cookies.size ? { cookie: this.cookieHeader } : {}),
        ...(body !== undefined && !(body instanceof FormData) && typeof body !== 'string' ? { 'content-type': 'application/json' } : {}),
        ...headers,
      },
      redirect: 'manual',
    }
    if (body !== undefined) init.body = body instanceof FormData || typeof body === 'string' ? body : JSON.stringify(body)
    const res = await fetch(new URL(path, this.baseUrl), init)
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';')
      const i = pair!.indexOf('=')
      const name = pair!.slice(0, i)
      const value = pair!.slice(i + 1)
      if (value === '' || /max-age=0/i.test(c) || /expires=Thu, 01 Jan 1970/i.test(c)) this.cookies.delete(name)
      else this.cookies.set(name, value)
    }
    const text = await res.text()
    let parsed: any = text
    if ((res.headers.get('content-type') ?? '').includes('json') && text) {
      try {
        parsed = JSON.parse(text)
      }
      catch { /* left as text */ }
    }
    return { status: res.status, body: parsed as T, headers: res.headers, text }
  }

  get<T = any>(path: string, headers?: Record<string, string>) { return this.request<T>('GET', path, undefined, headers) }
  post<T = any>(path: string, body?: unknown, headers?: Record<string, string>) { return this.request<T>('POST', path, body ?? {}, headers) }
  patch<T = any>(path: string, body?: unknown) { return this.request<T>('PATCH', path, body ?? {}) }
  put<T = any>(path: string, body?: unknown) { return this.request<T>('PUT', path, body ?? {}) }
  delete<T = any>(path: string) { return this.request<T>('DELETE', path) }

  async signIn(email: string, password = DEMO_PASSWORD): Promise<this> {
    const res = await this.post('/api/auth/login', { email, password })
    if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${res.text}`)
    return this
  }
}

export const DEMO_PASSWORD = process.env.DEMO_PASSWORD || 'barsmith-demo'

export const DEMO_EMAILS = {
  owner: 'owner@barsmith.test',
  producer: 'producer@barsmith.test',
  writer: 'writer@barsmith.test',
  cowriter: 'cowriter@barsmith.test',
  listener: 'listener@barsmith.test',
} as const

export function asDemo(role: keyof typeof DEMO_EMAILS): Promise<ApiClient> {
  return new ApiClient().signIn(DEMO_EMAILS[role])
}
