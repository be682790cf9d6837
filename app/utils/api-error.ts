export interface ApiErrorBody {
  statusCode: number
  message: string
  data?: { fields?: Record<string, string>, [key: string]: unknown }
}

/** The server's `{ statusCode, message, data }` from a failed `$fetch`, or a generic one. */
export function apiError(error: unknown): ApiErrorBody {
  const e = error as { data?: ApiErrorBody, statusCode?: number, message?: string }
  if (e?.data && typeof e.data.message === 'string') return e.data
  return { statusCode: e?.statusCode ?? 0, message: 'Barsmith could not be reached. Check your connection and try again.' }
}
