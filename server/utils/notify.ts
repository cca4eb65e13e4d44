import { Op } from 'sequelize'

export interface Notice {
  subject: string
  lines: string[]
  /** Path inside Mantissa the message links to. */
  path?: string
}

/**
 * E-mails members who have not turned notifications off. Sent after the change is saved and
 * never fatal: a mail server that is down must not undo a fact-check.
 */
export async function notifyUsers(userIds: (string | null | undefined)[], notice: Notice, exceptUserId?: string) {
  const ids = [...new Set(userIds.filter((id): id is string => Boolean(id) && id !== exceptUserId))]
  if (!ids.length) return
  const users = await useDb().models.User.findAll({ where: { id: { [Op.in]: ids }, notifyByEmail: true } })
  const link = notice.path ? `\n\n${useRuntimeConfig().publicUrl}${notice.path}` : ''
  const footer = '\n\n—\nYou get this because you are a member of a newsroom on Mantissa. Turn these e-mails off under "Your account".'
  await Promise.all(users.map(user => sendMail({ to: user.email, subject: notice.subject, text: `${notice.lines.join('\n\n')}${link}${footer}` })))
}

/** Members of a newsroom with one of the given roles. */
export async function membersWithRoles(newsroomId: string, roles: string[]): Promise<string[]> {
  const rows = await useDb().models.Membership.findAll({ where: { newsroomId, role: { [Op.in]: roles } }, attributes: ['userId'] })
  return rows.map(row => row.userId as string)
}
