import type { H3Event } from 'h3'
import type { z } from 'zod'

/** Deeper than this, a body is no form of Mantissa's: refused before anything walks it recursively. */
const MAX_DEPTH = 200

const NUL = /\0/
// A high surrogate not followed by a low one, or a low one not preceded by a high one.
const HALF_PAIR = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/

/**
 * Field errors for text PostgreSQL cannot store: NUL, and half of a surrogate pair (jsonb refuses
 * both, and a text column kept NUL as the two characters "\0"). Walks without recursion, so a
 * body nested 100,000 levels deep is refused here instead of overflowing the stack later.
 */
export function unstorableText(value: unknown): FieldError[] {
  const errors: FieldError[] = []
  const stack: { value: unknown, path: (string | number)[] }[] = [{ value, path: [] }]
  while (stack.length && errors.length < 10) {
    const { value: item, path } = stack.pop()!
    if (path.length > MAX_DEPTH) {
      errors.push({ path: path.slice(0, 1).join('.'), message: `This is nested more than ${MAX_DEPTH} levels deep.` })
      break
    }
    if (typeof item === 'string') {
      if (NUL.test(item)) errors.push({ path: path.join('.'), message: 'This text holds a NUL character (\\u0000), which cannot be stored. Remove it and try again.' })
      else if (HALF_PAIR.test(item)) errors.push({ path: path.join('.'), message: 'This text holds half of a character (an unpaired UTF-16 surrogate), which cannot be stored. Copy it again from its source.' })
    }
    else if (item && typeof item === 'object') {
      for (const [key, child] of Object.entries(item)) stack.push({ value: child, path: [...path, Array.isArray(item) ? Number(key) : key] })
    }
  }
  return errors
}

/** The largest JSON body: a prose block's document (at most 1,000,000 characters) with room to spare. */
export const MAX_JSON_BYTES = 4 * 1024 * 1024

function bodyTooLarge() {
  return fail(413, { message: `This request is larger than the ${MAX_JSON_BYTES / 1024 / 1024} MB a JSON body may be. Split the text into several blocks.` })
}

/**
 * The body as parsed JSON (undefined when empty or not JSON), refused with 413 as soon as it passes
 * MAX_JSON_BYTES. The rest of an oversized body is read and dropped, never held: destroying the
 * request instead would cut the connection under the answer.
 */
function readJson(event: H3Event): Promise<unknown> {
  const request = event.node.req
  if (Number(getRequestHeader(event, 'content-length') ?? 0) > MAX_JSON_BYTES) {
    request.resume()
    return Promise.reject(bodyTooLarge())
  }
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let size = 0
    const take = (chunk: Buffer) => {
      size += chunk.length
      if (size <= MAX_JSON_BYTES) return chunks.push(chunk)
      request.off('data', take)
      request.resume()
      reject(bodyTooLarge())
    }
    request.on('data', take)
    request.once('error', reject)
    request.once('end', () => {
      const text = Buffer.concat(chunks).toString('utf8')
      try {
        resolve(text.trim() ? JSON.parse(text) : undefined)
      }
      catch {
        resolve(undefined)
      }
    })
  })
}

/** Reads and validates the JSON body; a body that is not JSON, or a bad one, answers 400 with field messages. */
export async function readInput<T extends z.ZodType>(event: H3Event, schema: T): Promise<z.output<T>> {
  const type = getRequestHeader(event, 'content-type')
  // A form post is a request any page can send without asking; the API takes JSON only.
  if (type && !/^application\/([\w.+-]+\+)?json\b/i.test(type)) throw fail(400, { message: 'Send the body as JSON, with content-type: application/json.' })
  const body = await readJson(event)
  const unstorable = unstorableText(body)
  if (unstorable.length) throw fail(400, unstorable)
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
  const query = getQuery(event)
  const unstorable = unstorableText(query)
  if (unstorable.length) throw fail(400, unstorable)
  const result = schema.safeParse(query)
  if (!result.success) throw fail(400, fieldErrors(result.error))
  return result.data
}
