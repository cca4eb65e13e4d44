import { notificationQuerySchema } from '#shared/schemas/conversation'
import { listNotifications } from '#server/services/conversation/notifications'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const query = readQuery(event, notificationQuerySchema)
  return listNotifications(user.id, query)
})
