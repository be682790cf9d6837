import { readMailbox } from './mailbox'

export default defineEventHandler(async (event) => {
  const id = getRouterParam(event, 'id')
  const message = (await readMailbox()).find(m => m.id === id)
  if (!message) throw createError({ statusCode: 404, message: 'No such message in the local mailbox.' })
  return message
})
