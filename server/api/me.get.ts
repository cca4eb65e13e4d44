import { loadMe } from '#server/services/sign-in'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  return loadMe(user.id)
})
