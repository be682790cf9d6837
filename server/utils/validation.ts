import type { H3Event } from 'h3'
import type { z } from 'zod'

/**
 * Parses `input` with `schema`; on failure answers 400 with one message per field
 * (`data.fields`), which the forms show beside their inputs.
 */
export function parseOr400<S extends z.ZodType>(schema: S, input: unknown, what = 'request'): z.output<S> {
  const result = schema.safeParse(input)
  if (result.success) return result.data
  const fields: Record<string, string> = {}
  for (const issue of result.error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_'
    fields[key] ??= issue.message
  }
  const entries = Object.entries(fields)
  const [firstKey, firstMessage] = entries[0]!
  throw createError({
    statusCode: 400,
    statusMessage: 'Bad Request',
    message: entries.length === 1
      ? (firstKey === '_' ? firstMessage : `${firstKey}: ${firstMessage}`)
      : `Check the ${what}: ${entries.length} fields need attention.`,
    data: { fields },
  })
}

/** The JSON body, validated. A missing or non-JSON body is a 400 too. */
export async function validBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (type && !type.includes('application/json')) {
    throw createError({ statusCode: 415, message: 'Send the request body as JSON (Content-Type: application/json).' })
  }
  return parseOr400(schema, (await readBody(event)) ?? {}, 'form')
}

export function validQuery<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return parseOr400(schema, getQuery(event), 'query')
}

export function validParams<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return parseOr400(schema, getRouterParams(event, { decode: true }), 'address')
}

/**
 * The JSON body, refused with 413 past `maxBytes` (by Content-Length, or by what arrived) and
 * with 400 when it is not JSON. Validation is the caller's, after any limits of its own.
 */
export async function limitedJsonBody(event: H3Event, maxBytes: number): Promise<unknown> {
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (type && !type.includes('application/json')) {
    throw createError({ statusCode: 415, message: 'Send the request body as JSON (Content-Type: application/json).' })
  }
  const tooLarge = () => createError({ statusCode: 413, message: `The request is larger than ${Math.round(maxBytes / 1024)} KB; send fewer lines at a time.` })
  const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (declared > maxBytes) throw tooLarge()
  const raw = await readRawBody(event, 'utf8')
  if (raw && Buffer.byteLength(raw) > maxBytes) throw tooLarge()
  if (!raw) return {}
  try {
    return JSON.parse(raw)
  }
  catch {
    throw createError({ statusCode: 400, message: 'The body is not valid JSON.' })
  }
}
