import { NotificationsReadSchema } from '../../../shared/schemas/notifications'

/** Marks some of my notifications, or all of them, read. */
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const body = await validBody(event, NotificationsReadSchema)
  return markNotificationsRead(useDb(), user.id, 'all' in body ? 'all' : body.ids)
})
