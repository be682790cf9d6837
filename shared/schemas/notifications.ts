import { z } from 'zod'

export const NotificationsReadSchema = z.union([
  z.object({ ids: z.array(z.uuid({ error: 'ids holds notification ids.' }), { error: 'ids is a list.' }).min(1, 'Name at least one notification.').max(200) }).strict(),
  z.object({ all: z.literal(true) }).strict(),
], { error: 'Send { ids: [...] } or { all: true }.' })

export const NotificationsQuerySchema = z.object({
  unread: z.enum(['0', '1']).optional(),
})
