/**
 * `$fetch` for a URL built at run time. Nitro's typed routes make TypeScript compare every
 * route against a template string, which can exceed its stack depth; this keeps the call typed
 * by its result only.
 */
export function api<T = unknown>(url: string, options: { method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE', body?: any, query?: Record<string, any> } = {}): Promise<T> {
  return ($fetch as (u: string, o: typeof options) => Promise<T>)(url, options)
}
