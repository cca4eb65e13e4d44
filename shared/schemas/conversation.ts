import { z } from './zod'

/** The longest message, counted in characters of its text and its mentions' names as sent. */
export const MESSAGE_MAX = 4000

const partSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('text'), text: z.string().max(MESSAGE_MAX) }),
  z.object({ type: z.literal('mention'), userId: z.string().uuid() }),
])

/** A message as parts: text, and mentions of members by id. It must say something. */
export const messageSchema = z.object({
  parts: z.array(partSchema).min(1).max(200)
    .refine(parts => parts.some(p => p.type === 'mention' || p.text.trim()), 'Write a message first')
    .refine(parts => parts.reduce((n, p) => n + (p.type === 'text' ? p.text.length : 1), 0) <= MESSAGE_MAX, `A message holds at most ${MESSAGE_MAX} characters`),
})

/** Starts the thread of a subject, or adds to it when one exists. */
export const threadStartSchema = messageSchema.extend({
  subjectType: z.enum(['review', 'claim', 'block']),
  subjectId: z.string().uuid(),
})

export const notificationQuerySchema = z.object({
  before: z.string().regex(/^\d{1,18}$/, 'Use the `next` value of the page before').optional(),
  limit: z.coerce.number().int().min(0).max(100).default(30),
  unread: z.enum(['true', 'false']).optional(),
})

/** Marks some notifications read, or all of them. */
export const notificationReadSchema = z.union([
  z.object({ ids: z.array(z.string().regex(/^\d{1,18}$/)).min(1).max(200) }),
  z.object({ all: z.literal(true) }),
])
