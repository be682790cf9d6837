import { NotificationsQuerySchema } from '../../../shared/schemas/notifications'

/** My newest notifications (?unread=1 for unread only) and how many are unread. */
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { unread } = validQuery(event, NotificationsQuerySchema)
  return listNotifications(useDb(), user.id, unread === '1')
})
