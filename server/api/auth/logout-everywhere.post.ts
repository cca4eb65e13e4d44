import { recordAccountEvent } from '#server/services/account/audit'
import { endSessionsOf } from '#server/services/account/sessions'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const sessionsEnded = await endSessionsOf(user.id, 'signed-out-everywhere')
  await recordAccountEvent(user.id, 'account.signed-out-everywhere', { sessionsEnded })
  await clearUserSession(event)
  return { sessionsEnded }
})
