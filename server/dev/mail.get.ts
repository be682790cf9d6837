import { readMailbox } from './mailbox'

export default defineEventHandler(async () => {
  const messages = await readMailbox()
  return messages.map(({ id, receivedAt, to, subject, attachments }) => ({ id, receivedAt, to, subject, attachments }))
})
