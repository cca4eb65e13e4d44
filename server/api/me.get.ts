import { loadMe } from '../services/sign-in'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  return loadMe(user.id)
})
