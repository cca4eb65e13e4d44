import { listSessions } from '#server/services/account/sessions'

export default defineEventHandler(async (event) => {
  const { user, session } = await requireSession(event)
  return listSessions(user.id, session.id)
})
