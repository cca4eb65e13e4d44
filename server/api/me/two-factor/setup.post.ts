import { startTwoFactorSetup } from '#server/services/account/two-factor'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  return startTwoFactorSetup(user.id, user.email)
})
