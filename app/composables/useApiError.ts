export interface ApiFieldError {
  path: string
  message: string
}

interface ApiErrorLike {
  statusCode?: number
  statusMessage?: string
  data?: { statusMessage?: string, data?: unknown }
}

/** Turns an error from $fetch into what a form shows: one message and messages per field. */
export function describeApiError(error: unknown): { message: string, fields: Record<string, string> } {
  const e = error as ApiErrorLike
  const payload = e?.data?.data
  const fields: Record<string, string> = {}
  let detail: string | undefined
  if (Array.isArray(payload)) {
    for (const item of payload as ApiFieldError[]) fields[item.path] = item.message
  }
  else if (payload && typeof payload === 'object' && 'message' in payload) {
    detail = String((payload as { message: unknown }).message)
  }
  const status = e?.data?.statusMessage ?? e?.statusMessage
  const message = detail ?? (Object.keys(fields).length ? 'Check the highlighted fields.' : status ?? 'Something went wrong. Try again.')
  return { message, fields }
}
