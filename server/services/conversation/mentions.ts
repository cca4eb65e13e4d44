import { Op } from 'sequelize'
import type { Transaction } from 'sequelize'
import type { MessagePart, MessagePartDTO } from '#shared/types/conversation'
import { messageText } from '#shared/conversation/message-text'
import { investigationPath } from '#shared/conversation/anchor'

/**
 * The members a message mentions. A mention of anyone who is not a member of the newsroom is
 * refused (400), with the same words whether such a person exists elsewhere or not.
 */
export async function checkMentions(newsroomId: string, parts: MessagePart[], transaction?: Transaction): Promise<string[]> {
  const ids = [...new Set(parts.flatMap(p => (p.type === 'mention' ? [p.userId] : [])))]
  if (!ids.length) return []
  const members = new Set((await useDb().models.Membership.findAll({ where: { newsroomId, userId: { [Op.in]: ids } }, attributes: ['userId'], transaction }))
    .map(m => m.userId as string))
  const refused = parts.flatMap((p, i) => (p.type === 'mention' && !members.has(p.userId) ? [{ path: `parts.${i}.userId`, message: 'Only members of this newsroom can be mentioned.' }] : []))
  if (refused.length) throw fail(400, refused)
  return ids
}

/** Parts with each mention's name as it is now. */
export function describeParts(parts: MessagePart[], names: Map<string, string>): MessagePartDTO[] {
  return parts.map(p => (p.type === 'text' ? { type: 'text', text: p.text } : { type: 'mention', userId: p.userId, name: names.get(p.userId) ?? 'a former member' }))
}

export interface MentionMail {
  actorName: string
  newsroomId: string
  investigation: { id: string, title: string }
  anchor: string
  parts: MessagePartDTO[]
}

/**
 * E-mails the members a message mentions, unless they turned mention e-mails off. Sent after the
 * message is saved and never fatal. Membership is read again here, so nobody outside the
 * newsroom is ever written to.
 */
export async function mailMentions(userIds: string[], mail: MentionMail) {
  if (!userIds.length) return
  const { models } = useDb()
  const members = await models.Membership.findAll({ where: { newsroomId: mail.newsroomId, userId: { [Op.in]: userIds } }, attributes: ['userId'] })
  const users = await models.User.findAll({ where: { id: { [Op.in]: members.map(m => m.userId as string) }, emailMentions: true } })
  const link = `${useRuntimeConfig().publicUrl}${investigationPath(mail.investigation.id, mail.anchor)}`
  const text = [
    `${mail.actorName} mentioned you in a conversation on “${mail.investigation.title}”:`,
    messageText(mail.parts),
    link,
    '—\nYou get this because a member of your newsroom mentioned you on Mantissa. Turn mention e-mails off under "Your account".',
  ].join('\n\n')
  await Promise.all(users.map(user => sendMail({ to: user.email, subject: `${mail.actorName} mentioned you: ${mail.investigation.title}`, text })))
}
