import type { H3Event } from 'h3'
import type { z } from 'zod'

/** Reads and validates the JSON body; a bad body answers 400 with field messages. */
export async function readInput<T extends z.ZodType>(event: H3Event, schema: T): Promise<z.output<T>> {
  const body = await readBody(event).catch(() => undefined)
  const result = schema.safeParse(body ?? {})
  if (!result.success) throw fail(400, fieldErrors(result.error))
  return result.data
}

/** Reads and validates route parameters; an id that cannot exist answers 404, like a missing one. */
export function readParams<T extends z.ZodType>(event: H3Event, schema: T): z.output<T> {
  const result = schema.safeParse(getRouterParams(event, { decode: true }))
  if (!result.success) throw fail(404)
  return result.data
}

/** Reads and validates the query string; a bad query answers 400 with field messages. */
export function readQuery<T extends z.ZodType>(event: H3Event, schema: T): z.output<T> {
  const result = schema.safeParse(getQuery(event))
  if (!result.success) throw fail(400, fieldErrors(result.error))
  return result.data
}
