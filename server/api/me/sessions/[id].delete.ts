import { idParamsSchema } from '#shared/schemas/auth'
import { recordAccountEvent } from '#server/services/account/audit'
import { endOwnSession } from '#server/services/account/sessions'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { id } = readParams(event, idParamsSchema)
  await endOwnSession(user.id, id)
  await recordAccountEvent(user.id, 'account.session-ended', { sessionId: id })
  return { ok: true }
})
