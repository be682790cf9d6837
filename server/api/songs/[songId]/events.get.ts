import { randomUUID } from 'node:crypto'

/**
 * The song's live events as server-sent events: new versions, drafts, alts, votes, comments
 * and presence, published by any instance (NOTIFY barsmith_song). Members only; a member
 * removed from the crew is dropped at the next heartbeat. Comments keep proxies from
 * closing an idle stream.
 */
export default defineEventHandler(async (event) => {
  const { song, user, crewId } = await requireSongAccess(event, 'song.view')
  const db = useDb()
  const { req, res } = event.node
  const heartbeatMs = useEnv().LIVE_HEARTBEAT_MS
  const connection = { connectionId: randomUUID(), songId: song.id, userId: user.id }
  let ended = false

  const write = (chunk: string) => {
    if (!ended && !res.writableEnded) res.write(chunk)
  }
  const send = (type: string, data: unknown) => write(`event: ${type}\ndata: ${JSON.stringify(data)}\n\n`)

  const unsubscribe = await subscribeToSong(song.id, e => send(e.type, e))
  res.writeHead(200, {
    'content-type': 'text/event-stream; charset=utf-8',
    'cache-control': 'no-store, no-transform',
    'connection': 'keep-alive',
    'x-accel-buffering': 'no',
  })
  write(`retry: 3000\n\n`)
  // Joined before hello, so a client that got hello is already listed as present.
  await presenceJoin(db, connection).catch(() => {})
  send('hello', { connectionId: connection.connectionId, songId: song.id, userId: user.id, heartbeatMs })

  let finish!: () => void
  const closed = new Promise<void>(resolve => (finish = resolve))
  const timer = setInterval(async () => {
    write(': keep-alive\n\n')
    try {
      if (!(await isCrewMember(db, crewId, user.id))) {
        send('closed', { reason: 'You are no longer a member of this crew.' })
        finish()
        return
      }
      await presenceBeat(db, connection.connectionId)
    }
    catch { /* the database being away for a beat does not end the stream */ }
  }, heartbeatMs)
  req.on('close', finish)
  res.on('close', finish)
  openStreams.add(finish)

  await closed
  ended = true
  openStreams.delete(finish)
  clearInterval(timer)
  unsubscribe()
  if (!res.writableEnded) res.end()
  await presenceLeave(db, connection).catch(() => {})
})
