import type { ZodError } from 'zod'

/** Fixed short texts: the only statusText values Mantissa sends (never user input). */
export const STATUS_TEXT = {
  400: 'Invalid input',
  401: 'Sign in first',
  403: 'Not allowed',
  404: 'Not found',
  409: 'Changed by someone else',
  410: 'No longer available',
  413: 'File too large',
  415: 'Unsupported file',
  422: 'Cannot be processed',
  423: 'Locked',
  429: 'Too many attempts',
  503: 'Server busy',
} as const

export type FailStatus = keyof typeof STATUS_TEXT

export interface FieldError {
  path: string
  message: string
}

/** Builds Mantissa's one error shape: `{ statusCode, statusMessage, data }`. */
export function fail(status: FailStatus, data?: unknown) {
  return createError({ status, statusText: STATUS_TEXT[status], data })
}

export function fieldErrors(error: ZodError): FieldError[] {
  return error.issues.map(issue => ({ path: issue.path.join('.'), message: issue.message }))
}
