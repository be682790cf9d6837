import { retryDelayMs } from '~~/shared/utils/pending-save'

export interface SongLiveEvent {
  type: string
  songId: string
  at: number
  [key: string]: unknown
}

type Handler = (event: SongLiveEvent) => void

/** The event types the server sends; `resync` is ours, after a reconnect (refetch what you show). */
export const SONG_EVENT_TYPES = ['hello', 'version', 'draft', 'alt', 'vote', 'comment', 'presence', 'signoff', 'closed'] as const

interface Stream {
  source: EventSource | null
  handlers: Map<string, Set<Handler>>
  users: number
  connected: Ref<boolean>
  connectionId: Ref<string | null>
  attempts: number
  everConnected: boolean
  retry?: ReturnType<typeof setTimeout>
}

// One EventSource per song per tab, shared by every component that listens to that song.
const streams = new Map<string, Stream>()

function emit(stream: Stream, type: string, event: SongLiveEvent) {
  for (const fn of stream.handlers.get(type) ?? []) fn(event)
  for (const fn of stream.handlers.get('*') ?? []) fn(event)
}

function connect(songId: string, stream: Stream) {
  const source = new EventSource(`/api/songs/${songId}/events`, { withCredentials: true })
  stream.source = source
  for (const type of SONG_EVENT_TYPES) {
    source.addEventListener(type, (message) => {
      let data: SongLiveEvent
      try {
        data = JSON.parse((message as MessageEvent).data)
      }
      catch {
        return
      }
      if (type === 'hello') {
        stream.connected.value = true
        stream.connectionId.value = String(data.connectionId ?? '')
        stream.attempts = 0
        if (stream.everConnected) emit(stream, 'resync', data)
        stream.everConnected = true
      }
      emit(stream, type, data)
      // The server dropped us for good (no longer a member): do not reconnect.
      if (type === 'closed') close(songId, stream, true)
    })
  }
  source.onerror = () => {
    stream.connected.value = false
    // The browser retries a dropped stream by itself; a refused one (4xx/5xx) ends CLOSED.
    if (source.readyState === EventSource.CLOSED) {
      source.close()
      stream.source = null
      stream.retry = setTimeout(() => {
        if (stream.users > 0 && !stream.source) connect(songId, stream)
      }, retryDelayMs(++stream.attempts))
    }
  }
}

function close(songId: string, stream: Stream, forGood = false) {
  clearTimeout(stream.retry)
  stream.source?.close()
  stream.source = null
  stream.connected.value = false
  if (!forGood) streams.delete(songId)
}

/**
 * Live events of one song (new versions, drafts, alts, votes, comments, presence) over
 * server-sent events, reconnecting after a drop. `on(type, fn)` returns an unsubscribe;
 * handlers and the shared connection end with the calling component.
 */
export function useSongEvents(songId: MaybeRefOrGetter<string>) {
  const id = computed(() => toValue(songId))
  const own: Array<{ type: string, fn: Handler }> = []
  const connected = ref(false)
  const connectionId = ref<string | null>(null)
  let joined: string | null = null

  function streamFor(sid: string): Stream {
    let s = streams.get(sid)
    if (!s) streams.set(sid, s = { source: null, handlers: new Map(), users: 0, connected: ref(false), connectionId: ref(null), attempts: 0, everConnected: false })
    return s
  }

  function join(sid: string) {
    const s = streamFor(sid)
    s.users++
    for (const { type, fn } of own) {
      if (!s.handlers.has(type)) s.handlers.set(type, new Set())
      s.handlers.get(type)!.add(fn)
    }
    if (!s.source) connect(sid, s)
    joined = sid
  }

  function leave() {
    if (!joined) return
    const sid = joined
    const s = streams.get(sid)
    joined = null
    if (!s) return
    for (const { type, fn } of own) s.handlers.get(type)?.delete(fn)
    if (--s.users <= 0) close(sid, s)
  }

  function on(type: string, fn: Handler) {
    own.push({ type, fn })
    if (joined) {
      const s = streamFor(joined)
      if (!s.handlers.has(type)) s.handlers.set(type, new Set())
      s.handlers.get(type)!.add(fn)
    }
    return () => {
      const i = own.findIndex(o => o.fn === fn && o.type === type)
      if (i >= 0) own.splice(i, 1)
      if (joined) streams.get(joined)?.handlers.get(type)?.delete(fn)
    }
  }

  if (import.meta.client) {
    onMounted(() => {
      join(id.value)
      watchEffect(() => {
        const s = joined ? streams.get(joined) : undefined
        connected.value = s?.connected.value ?? false
        connectionId.value = s?.connectionId.value ?? null
      })
    })
    watch(id, (next, previous) => {
      if (next === previous || !joined) return
      leave()
      join(next)
    })
    onBeforeUnmount(leave)
  }

  return { connected, connectionId, on }
}
