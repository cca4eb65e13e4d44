import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import type { ConversationDTO, MessageKind, MessagePart, ThreadDTO, ThreadSubjectType } from '#shared/types/conversation'
import { messageText } from '#shared/conversation/message-text'
import { subjectAnchor } from '#shared/conversation/anchor'
import type { Investigation, Thread, ThreadMessage } from '../../models'
import type { Actor } from '../../utils/permissions'
import { findInvestigation, stamp, userNames } from '../investigations/catalog'
import { attachedClaims } from '../investigations/prose-claims'
import { checkMentions, describeParts, mailMentions } from './mentions'
import { recordNotifications } from './notifications'

export interface Subject { type: ThreadSubjectType, id: string }

/** The thread behind an id with its investigation, for the permission check; 404 when missing. */
export async function findThread(id: string): Promise<{ thread: Thread, investigation: Investigation }> {
  const thread = await useDb().models.Thread.findByPk(id)
  if (!thread) throw fail(404)
  return { thread, investigation: await findInvestigation(thread.investigationId) }
}

function threadDTO(thread: Thread, messages: ThreadMessage[], names: Map<string, string>): ThreadDTO {
  return {
    id: thread.id, subjectType: thread.subjectType, subjectId: thread.subjectId, blockId: thread.blockId,
    messages: messages.map(m => ({
      id: m.id, kind: m.kind, author: m.authorId ? names.get(m.authorId) ?? 'a former member' : 'a former member', authorId: m.authorId,
      parts: describeParts(m.parts, names), at: m.createdAt.toISOString(),
    })),
    resolved: stamp(thread.resolvedBy, thread.resolvedAt, names),
    reopened: stamp(thread.reopenedBy, thread.reopenedAt, names),
  }
}

async function describeThreads(threads: Thread[]): Promise<ThreadDTO[]> {
  if (!threads.length) return []
  const messages = await useDb().models.ThreadMessage.findAll({ where: { threadId: { [Op.in]: threads.map(t => t.id) } }, order: [['createdAt', 'ASC'], ['id', 'ASC']] })
  const names = await userNames([
    ...threads.flatMap(t => [t.resolvedBy, t.reopenedBy]),
    ...messages.flatMap(m => [m.authorId, ...m.mentionedIds]),
  ])
  return threads.map(t => threadDTO(t, messages.filter(m => m.threadId === t.id), names))
}

/** One thread with its messages, as the conversation lists it. */
export async function describeThread(threadId: string): Promise<ThreadDTO> {
  const thread = await useDb().models.Thread.findByPk(threadId)
  if (!thread) throw fail(404)
  return (await describeThreads([thread]))[0]!
}

/** Every thread of an investigation with its messages, and the members a new message may mention. */
export async function listConversation(investigation: Investigation): Promise<ConversationDTO> {
  const { models } = useDb()
  const threads = await models.Thread.findAll({ where: { investigationId: investigation.id }, order: [['createdAt', 'ASC']] })
  const members = await models.Membership.findAll({ where: { newsroomId: investigation.newsroomId }, include: [{ model: models.User, as: 'user', attributes: ['id', 'name'] }] })
  return {
    threads: await describeThreads(threads),
    members: members.map(m => ({ id: m.userId as string, name: m.user?.name ?? '' })).sort((a, b) => a.name.localeCompare(b.name)),
  }
}

/**
 * Where a subject's thread is drawn: its block (a claim's, the reviewed analysis block's), which
 * must be live in this investigation. Anything else, another newsroom's included, is refused alike.
 */
async function placeOf(investigation: Investigation, subject: Subject, transaction?: Transaction): Promise<string> {
  const { models } = useDb()
  const missing = () => fail(400, [{ path: 'subjectId', message: subject.type === 'claim' ? 'This investigation has no such claim.' : 'This investigation has no such block.' }])
  if (subject.type === 'claim') {
    const claim = await models.Claim.findOne({ where: { id: subject.id, investigationId: investigation.id }, transaction })
    const block = claim && await models.Block.findOne({ where: { id: claim.blockId, deletedAt: null }, attributes: ['id', 'content'], transaction })
    if (!claim || !block || !attachedClaims([claim], [block]).length) throw missing()
    return block.id
  }
  const block = await models.Block.findOne({ where: { id: subject.id, investigationId: investigation.id, deletedAt: null }, attributes: ['id', 'kind'], transaction })
  if (!block || (subject.type === 'review' && block.kind !== 'analysis')) throw missing()
  return block.id
}

/** The subject's thread, made when it has none; the unique subject makes two first messages share one. */
async function threadFor(actor: Actor, investigation: Investigation, subject: Subject, blockId: string, transaction: Transaction): Promise<Thread> {
  const { sequelize, models } = useDb()
  await sequelize.query(`
    INSERT INTO threads (investigation_id, subject_type, subject_id, block_id, created_by) VALUES (:investigationId, :type, :id, :blockId, :actorId)
    ON CONFLICT (investigation_id, subject_type, subject_id) DO NOTHING`, { replacements: { investigationId: investigation.id, type: subject.type, id: subject.id, blockId, actorId: actor.userId }, transaction })
  return (await models.Thread.findOne({ where: { investigationId: investigation.id, subjectType: subject.type, subjectId: subject.id }, transaction, lock: transaction.LOCK.UPDATE }))!
}

function audit(actor: Actor, thread: Thread, action: string, detail: Record<string, unknown>, transaction: Transaction) {
  return recordAudit({
    newsroomId: actor.newsroomId, investigationId: thread.investigationId, actorId: actor.userId, action, subjectType: 'thread', subjectId: thread.id,
    detail: { about: thread.subjectType, [thread.subjectType === 'claim' ? 'claimId' : 'blockId']: thread.subjectId, ...detail },
  }, transaction)
}

interface Posted { mentioned: string[], parts: MessagePart[] }

/**
 * Adds a message to a locked thread: a resolved thread opens again (audited), the members it
 * mentions are notified, and so is everyone who wrote in it before (unless already told of this
 * change, as the reporter is of a method sent back).
 */
async function addMessage(actor: Actor, investigation: Investigation, thread: Thread, parts: MessagePart[], kind: MessageKind, transaction: Transaction, told: string[] = []): Promise<Posted> {
  const { models } = useDb()
  const mentioned = await checkMentions(investigation.newsroomId, parts, transaction)
  const earlier = await models.ThreadMessage.findAll({ where: { threadId: thread.id }, attributes: ['authorId'], transaction })
  await models.ThreadMessage.create({ threadId: thread.id, authorId: actor.userId, kind, parts, mentionedIds: mentioned }, { transaction })
  if (thread.resolvedAt) {
    await thread.update({ resolvedBy: null, resolvedAt: null, reopenedBy: actor.userId, reopenedAt: new Date() }, { transaction })
    await audit(actor, thread, 'thread.reopened', { by: 'a new message' }, transaction)
  }
  const names = await userNames(mentioned)
  const event = {
    newsroomId: investigation.newsroomId, investigationId: investigation.id, actorId: actor.userId,
    anchor: subjectAnchor(thread.subjectType, thread.subjectId), threadId: thread.id, excerpt: messageText(describeParts(parts, names)),
  }
  const notifiedOfMention = await recordNotifications(mentioned, { ...event, kind: 'mention' }, transaction)
  const skip = new Set([...mentioned, ...told])
  await recordNotifications([thread.createdBy, ...earlier.map(m => m.authorId)].filter(id => !id || !skip.has(id)), { ...event, kind: 'reply' }, transaction)
  return { mentioned: notifiedOfMention, parts }
}

async function mailAfter(actor: Actor, investigation: Investigation, thread: Thread, posted: Posted) {
  await mailMentions(posted.mentioned, {
    actorName: actor.name, newsroomId: investigation.newsroomId, investigation,
    anchor: subjectAnchor(thread.subjectType, thread.subjectId), parts: describeParts(posted.parts, await userNames(posted.mentioned)),
  })
}

/** Starts the thread of a block, a review or a claim with a first message, or adds to the one it has. */
export async function startThread(actor: Actor, investigation: Investigation, subject: Subject, parts: MessagePart[]): Promise<ThreadDTO> {
  const blockId = await placeOf(investigation, subject)
  const { thread, posted } = await useDb().sequelize.transaction(async (transaction) => {
    const thread = await threadFor(actor, investigation, subject, blockId, transaction)
    return { thread, posted: await addMessage(actor, investigation, thread, parts, 'message', transaction) }
  })
  await mailAfter(actor, investigation, thread, posted)
  return describeThread(thread.id)
}

/** A reply in an existing thread. */
export async function replyToThread(actor: Actor, investigation: Investigation, thread: Thread, parts: MessagePart[]): Promise<ThreadDTO> {
  const posted = await useDb().sequelize.transaction(async (transaction) => {
    const current = await useDb().models.Thread.findByPk(thread.id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!current) throw fail(404)
    return addMessage(actor, investigation, current, parts, 'message', transaction)
  })
  await mailAfter(actor, investigation, thread, posted)
  return describeThread(thread.id)
}

/** Resolves or reopens a thread; both go to the audit trail, and doing what is already done changes nothing. */
export async function setResolved(actor: Actor, thread: Thread, resolved: boolean): Promise<ThreadDTO> {
  await useDb().sequelize.transaction(async (transaction) => {
    const current = await useDb().models.Thread.findByPk(thread.id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!current) throw fail(404)
    if (Boolean(current.resolvedAt) === resolved) return
    const now = new Date()
    await current.update(resolved ? { resolvedBy: actor.userId, resolvedAt: now } : { resolvedBy: null, resolvedAt: null, reopenedBy: actor.userId, reopenedAt: now }, { transaction })
    await audit(actor, current, resolved ? 'thread.resolved' : 'thread.reopened', {}, transaction)
  })
  return describeThread(thread.id)
}

/**
 * A decision's note (a method sent back, a claim disputed) as a message of its subject's thread,
 * inside the decision's transaction. `told`: who the decision itself notifies already.
 */
export async function noteInThread(actor: Actor, investigation: Investigation, subject: Subject & { blockId: string }, note: string, kind: MessageKind, told: string[], transaction: Transaction) {
  const thread = await threadFor(actor, investigation, subject, subject.blockId, transaction)
  await addMessage(actor, investigation, thread, [{ type: 'text', text: note }], kind, transaction, told)
  return thread.id
}
