import type { ZodType, output } from 'zod'

/**
 * The state of a form or button that calls the API: `busy` while it runs, then the error's message
 * and field messages (`describeApiError`). `submit` validates with the form's shared schema first
 * and calls the API only with valid data.
 */
export function useApiAction() {
  const error = ref('')
  const fields = ref<Record<string, string>>({})
  const busy = ref(false)

  /** `onError` sees the failure too, for a form that reads more of the reply than its messages. */
  async function run(action: () => Promise<void>, { onError }: { onError?: (error: unknown) => void } = {}) {
    error.value = ''
    fields.value = {}
    busy.value = true
    try {
      await action()
    }
    catch (e) {
      ;({ message: error.value, fields: fields.value } = describeApiError(e))
      onError?.(e)
    }
    finally {
      busy.value = false
    }
  }

  async function submit<S extends ZodType>(schema: S, values: unknown, action: (data: output<S>) => Promise<void>, options: { onError?: (error: unknown) => void } = {}) {
    const parsed = schema.safeParse(values)
    if (!parsed.success) {
      error.value = ''
      fields.value = Object.fromEntries(parsed.error.issues.map(i => [i.path.join('.'), i.message]))
      return
    }
    await run(() => action(parsed.data), options)
  }

  return { error, fields, busy, run, submit }
}
