import { notificationReadSchema } from '#shared/schemas/conversation'
import { markNotificationsRead } from '#server/services/conversation/notifications'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const input = await readInput(event, notificationReadSchema)
  return markNotificationsRead(user.id, input)
})
