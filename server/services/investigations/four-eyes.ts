import type { Transaction } from 'sequelize'
import type { Actor } from '../../utils/permissions'

const REFUSALS = {
  method: 'Four eyes: you wrote or last changed this analysis block, so another data editor must approve its method.',
  claim: 'Four eyes: you marked this claim or wrote the text it sits in, so another fact-checker must verify it.',
} as const

/**
 * Under the newsroom's four-eyes setting (on unless an admin turns it off), refuses with 403 a
 * check made by one of the people who made what is being checked.
 */
export async function assertFourEyes(actor: Actor, authors: (string | null | undefined)[], what: keyof typeof REFUSALS, transaction?: Transaction) {
  if (!authors.includes(actor.userId)) return
  const newsroom = await useDb().models.Newsroom.findByPk(actor.newsroomId, { attributes: ['fourEyes'], transaction })
  if (newsroom && !newsroom.fourEyes) return
  throw fail(403, { message: REFUSALS[what], rule: 'four-eyes' })
}
