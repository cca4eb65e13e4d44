import { endCurrentSession } from '#server/services/account/sessions'

export default defineEventHandler(async (event) => {
  await endCurrentSession(event)
  return { ok: true }
})
