import type { z } from 'zod'

/**
 * Form state for a zod schema shared with the server: checks the input locally first, then
 * shows the server's own messages (`data.fields`) beside the same fields.
 */
export function useApiForm<S extends z.ZodType, R>(schema: S, send: (input: z.output<S>) => Promise<R>) {
  const pending = ref(false)
  const message = ref('')
  const fields = ref<Record<string, string>>({})

  async function submit(input: z.input<S>): Promise<R | undefined> {
    message.value = ''
    fields.value = {}
    const parsed = schema.safeParse(input)
    if (!parsed.success) {
      for (const issue of parsed.error.issues) fields.value[issue.path.join('.') || '_'] ??= issue.message
      message.value = fields.value._ ?? 'Check the highlighted fields.'
      return undefined
    }
    pending.value = true
    try {
      return await send(parsed.data)
    }
    catch (error) {
      const body = apiError(error)
      fields.value = body.data?.fields ?? {}
      message.value = body.message
      return undefined
    }
    finally {
      pending.value = false
    }
  }

  return { pending, message, fields, submit }
}
