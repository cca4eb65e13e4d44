import { loadMe } from '#server/services/sign-in'

export default defineEventHandler(async (event) => {
  const { user, session } = await requireSession(event)
  return loadMe(user.id, session.secondFactor)
})
