import { confirmPending, hasUnsavedWork, outcomeOfError, readPending, retryDelayMs, writePending, pendingKey, type KeyValueStore, type PendingSave, type SaveConflict, type SaveOutcome, type VersionRef } from '~~/shared/utils/pending-save'
import type { LyricDoc, LyricLine } from '~~/shared/utils/lyric-doc'

export type SaverStatus = 'clean' | 'unsaved' | 'saving' | 'offline' | 'conflict' | 'refused'

export interface SaverHead { id: string | null, number?: number, lines: LyricLine[], doc?: LyricDoc }

export interface DraftSaverOptions {
  draftId: MaybeRefOrGetter<string>
  /** The version the editor shows (null until loaded). When it changes and nothing is unsaved, the saver follows it. */
  head: MaybeRefOrGetter<SaverHead | null>
  /** Autosave after this pause in typing (ms); 0 turns autosave off. */
  autosaveMs?: number
  /** Where unsaved work waits (default: the browser's localStorage). */
  storage?: KeyValueStore
}

const noStorage: KeyValueStore = { getItem: () => null, setItem: () => {}, removeItem: () => {} }

/**
 * Saving a draft without ever losing a word: every edit is kept in the browser's storage
 * until the server confirms it (it survives a reload and a dropped connection), saves name
 * the version they started from, autosave runs after a pause, and a 409 keeps the text and
 * exposes the conflict (the head and the kept-aside save) for the merge view.
 * One saver serves one draft: key the editor that uses it by the draft's id.
 */
export function useDraftSaver(options: DraftSaverOptions) {
  const draftId = computed(() => toValue(options.draftId))
  const autosaveMs = options.autosaveMs ?? 4000
  const store = (): KeyValueStore => options.storage ?? (import.meta.client ? window.localStorage : noStorage)

  const lines = ref<LyricLine[]>([])
  const doc = ref<LyricDoc | undefined>()
  const baseVersionId = ref<string | null>(null)
  const status = ref<SaverStatus>('clean')
  const conflict = ref<SaveConflict | null>(null)
  const lastSaved = ref<VersionRef | null>(null)
  const error = ref('')
  /** True when unsaved work from an earlier visit was put back. */
  const restored = ref(false)
  const ready = ref(false)
  let changedAt = 0
  let note: string | undefined
  let timer: ReturnType<typeof setTimeout> | undefined
  let attempts = 0
  let saving: Promise<SaveOutcome | null> | null = null
  let again = false

  const dirty = computed(() => status.value !== 'clean' && status.value !== 'saving')

  function keep() {
    const pending: PendingSave = { v: 1, draftId: draftId.value, baseVersionId: baseVersionId.value, lines: lines.value, changedAt, conflict: conflict.value }
    if (doc.value) pending.doc = doc.value
    if (note) pending.note = note
    if (!writePending(store(), pending)) error.value = 'This browser would not keep a copy of your unsaved text (storage full or off). Save before leaving.'
  }

  function schedule(ms = autosaveMs) {
    clearTimeout(timer)
    if (!ms || conflict.value) return
    timer = setTimeout(() => void save({ autosave: true }), ms)
  }

  /** Loads the head, or the unsaved work kept in this browser when it still differs from it. */
  function load(head: SaverHead) {
    const pending = readPending(store(), draftId.value)
    if (hasUnsavedWork(pending, head.lines, head.id)) {
      lines.value = pending!.lines
      doc.value = pending!.doc
      note = pending!.note
      baseVersionId.value = pending!.baseVersionId
      changedAt = pending!.changedAt
      conflict.value = pending!.conflict ?? null
      restored.value = true
      status.value = conflict.value ? 'conflict' : 'unsaved'
      schedule(500)
    }
    else {
      if (pending) store().removeItem(pendingKey(draftId.value))
      lines.value = head.lines
      doc.value = head.doc
      baseVersionId.value = head.id
      status.value = 'clean'
    }
    ready.value = true
  }

  /** The editor reports every change here: kept at once, saved after a pause. */
  function edit(next: LyricLine[], nextDoc?: LyricDoc) {
    lines.value = next
    doc.value = nextDoc
    changedAt = Date.now()
    error.value = ''
    if (!conflict.value && status.value !== 'saving') status.value = 'unsaved'
    keep()
    schedule()
  }

  /** Saves now (with an optional note). Resolves with what the server said, or null when there was nothing to do. */
  async function save(opts: { note?: string, autosave?: boolean } = {}): Promise<SaveOutcome | null> {
    clearTimeout(timer)
    if (opts.note !== undefined) note = opts.note
    if (conflict.value) return { kind: 'conflict', conflict: conflict.value }
    if (saving) {
      again = true
      return saving
    }
    if (status.value === 'clean' && opts.note === undefined) return null
    const sentChangedAt = changedAt
    const body = { baseVersionId: baseVersionId.value, lines: lines.value, ...(doc.value ? { doc: doc.value } : {}), ...(note ? { note } : {}), ...(opts.autosave ? { autosave: true } : {}) }
    status.value = 'saving'
    saving = (async () => {
      let outcome: SaveOutcome
      try {
        const version = await api<VersionRef>(`/api/drafts/${draftId.value}/versions`, { method: 'POST', body })
        outcome = { kind: 'saved', version }
      }
      catch (e) {
        outcome = outcomeOfError(e)
      }
      if (outcome.kind === 'saved') {
        attempts = 0
        baseVersionId.value = outcome.version.id
        lastSaved.value = outcome.version
        note = undefined
        const left = confirmPending(store(), draftId.value, sentChangedAt, outcome.version)
        status.value = left || changedAt > sentChangedAt ? 'unsaved' : 'clean'
        if (status.value === 'unsaved') {
          keep()
          schedule()
        }
      }
      else if (outcome.kind === 'conflict') {
        conflict.value = outcome.conflict
        status.value = 'conflict'
        keep()
      }
      else if (outcome.kind === 'offline') {
        status.value = 'offline'
        error.value = 'No connection to Barsmith. Your text is kept in this browser and will be sent again.'
        schedule(retryDelayMs(++attempts))
      }
      else {
        status.value = 'refused'
        error.value = outcome.message
      }
      return outcome
    })()
    try {
      return await saving
    }
    finally {
      saving = null
      if (again) {
        again = false
        if ((status.value as SaverStatus) === 'unsaved') void save({ autosave: true })
      }
    }
  }

  /** After the merge view saved the merged text: it becomes the base, and nothing is pending. */
  function resolve(version: VersionRef, merged: LyricLine[], mergedDoc?: LyricDoc) {
    clearTimeout(timer)
    store().removeItem(pendingKey(draftId.value))
    conflict.value = null
    lines.value = merged
    doc.value = mergedDoc
    baseVersionId.value = version.id
    lastSaved.value = version
    restored.value = false
    status.value = 'clean'
    error.value = ''
  }

  /** Drops the unsaved text kept in this browser and goes back to `head`. */
  function discard(head: SaverHead) {
    clearTimeout(timer)
    store().removeItem(pendingKey(draftId.value))
    conflict.value = null
    restored.value = false
    load(head)
  }

  if (import.meta.client) {
    const online = () => {
      if (status.value === 'offline') void save({ autosave: true })
    }
    onMounted(() => {
      window.addEventListener('online', online)
      const head = toValue(options.head)
      if (head) load(head)
    })
    onBeforeUnmount(() => {
      window.removeEventListener('online', online)
      clearTimeout(timer)
    })
    // A newer head (someone else saved, or the page reloaded it): follow it when nothing is unsaved.
    watch(() => toValue(options.head), (head) => {
      if (!head) return
      if (!ready.value) return load(head)
      if (status.value === 'clean' && head.id !== baseVersionId.value) {
        lines.value = head.lines
        doc.value = head.doc
        baseVersionId.value = head.id
      }
    })
  }

  return { lines, doc, baseVersionId, status, dirty, conflict, lastSaved, error, restored, ready, edit, save, resolve, discard }
}
