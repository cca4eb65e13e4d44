import type { Stamp } from './investigation'

/** What a thread is about: a method review (an analysis block's id), a claim, or a block. */
export type ThreadSubjectType = 'review' | 'claim' | 'block'

/** A message is plain text in parts; a mention names a member by id, and is drawn with their name now. */
export type MessagePart = { type: 'text', text: string } | { type: 'mention', userId: string }
export type MessagePartDTO = { type: 'text', text: string } | { type: 'mention', userId: string, name: string }

/** 'sent-back' and 'disputed' are the notes that started a thread by sending back a method or disputing a claim. */
export type MessageKind = 'message' | 'sent-back' | 'disputed'

export interface MessageDTO {
  id: string
  kind: MessageKind
  author: string
  authorId: string | null
  parts: MessagePartDTO[]
  at: string
}

/**
 * What a decision whose note is a message of its subject's conversation (a claim disputed, a method
 * sent back) answers: the record as it now is, with that conversation as it now is.
 */
export type WithThread<T> = T & { thread: ThreadDTO }

export interface ThreadDTO {
  id: string
  subjectType: ThreadSubjectType
  subjectId: string
  blockId: string
  messages: MessageDTO[]
  /** Who resolved it and when; null while it is open. */
  resolved: Stamp | null
  /** Who reopened it last and when, if it was. */
  reopened: Stamp | null
}

/** The conversations of one investigation, and the members a message may mention. */
export interface ConversationDTO {
  threads: ThreadDTO[]
  members: { id: string, name: string }[]
}

export const NOTIFICATION_KINDS = ['review-requested', 'sent-back', 'disputed', 'verified', 'lock-lifted', 'mention', 'reply', 'published'] as const
export type NotificationKind = typeof NOTIFICATION_KINDS[number]

export interface NotificationDTO {
  id: string
  kind: NotificationKind
  actor: string
  investigationId: string
  investigationTitle: string
  /** Where it points inside Mantissa: the investigation with the block, claim or review in its hash. */
  path: string
  excerpt: string
  at: string
  read: boolean
}

/** A page of the signed-in member's notifications, newest first; `next` goes in `before`. */
export interface NotificationPageDTO {
  unread: number
  items: NotificationDTO[]
  next: string | null
}
