import { describe, expect, it } from 'vitest'
import { confirmPending, hasUnsavedWork, outcomeOfError, pendingKey, readPending, retryDelayMs, writePending, type KeyValueStore, type PendingSave } from '../../shared/utils/pending-save'

function memoryStore(): KeyValueStore & { map: Map<string, string> } {
  const map = new Map<string, string>()
  return { map, getItem: k => map.get(k) ?? null, setItem: (k, v) => void map.set(k, v), removeItem: k => void map.delete(k) }
}

const pending = (over: Partial<PendingSave> = {}): PendingSave => ({
  v: 1, draftId: 'd1', baseVersionId: 'v1', lines: [{ id: 'a', bar: 1, text: 'unsaved words' }], changedAt: 1000, ...over,
})

describe('unsaved work kept in the browser', () => {
  it('round-trips through storage and ignores what is not ours', () => {
    const store = memoryStore()
    expect(readPending(store, 'd1')).toBeNull()
    expect(writePending(store, pending())).toBe(true)
    expect(readPending(store, 'd1')).toEqual(pending())
    store.map.set(pendingKey('d2'), '{not json')
    expect(readPending(store, 'd2')).toBeNull()
    store.map.set(pendingKey('d3'), JSON.stringify({ ...pending(), draftId: 'd3', lines: [{ id: 'a', bar: 0, text: 'bar zero' }] }))
    expect(readPending(store, 'd3')).toBeNull()
    store.map.set(pendingKey('d4'), JSON.stringify(pending()))
    expect(readPending(store, 'd4')).toBeNull()
  })

  it('is reported as not written when the browser refuses', () => {
    const full: KeyValueStore = {
      getItem: () => null,
      setItem: () => {
        throw new Error('QuotaExceededError')
      },
      removeItem: () => {},
    }
    expect(writePending(full, pending())).toBe(false)
  })

  it('is forgotten once saved, unless it changed after the save was sent (then it moves to the new base)', () => {
    const store = memoryStore()
    writePending(store, pending({ changedAt: 1000 }))
    expect(confirmPending(store, 'd1', 1000, { id: 'v2', number: 2 })).toBeNull()
    expect(readPending(store, 'd1')).toBeNull()

    writePending(store, pending({ changedAt: 2000, conflict: { head: { id: 'v9', number: 9 }, sideSaveId: 's' } }))
    const rebased = confirmPending(store, 'd1', 1000, { id: 'v2', number: 2 })
    expect(rebased).toMatchObject({ baseVersionId: 'v2', changedAt: 2000, conflict: null })
    expect(readPending(store, 'd1')).toEqual(rebased)
  })

  it('tells whether kept work differs from what the server holds', () => {
    const lines = [{ id: 'a', bar: 1, text: 'unsaved words' }]
    expect(hasUnsavedWork(null, lines, 'v1')).toBe(false)
    expect(hasUnsavedWork(pending(), lines, 'v1')).toBe(false)
    expect(hasUnsavedWork(pending(), [{ id: 'a', bar: 1, text: 'saved words' }], 'v1')).toBe(true)
    expect(hasUnsavedWork(pending(), lines, 'v2')).toBe(true)
    expect(hasUnsavedWork(pending({ conflict: { head: null, sideSaveId: null } }), lines, 'v1')).toBe(true)
  })
})

describe('reading a save\'s answer', () => {
  it('a 409 with the head is a conflict; no answer or 502–504 is offline; other codes are refusals', () => {
    const head = { id: 'v3', number: 3 }
    expect(outcomeOfError({ statusCode: 409, data: { statusCode: 409, message: 'stale', data: { head, sideSaveId: 's1' } } }))
      .toEqual({ kind: 'conflict', conflict: { head, sideSaveId: 's1' } })
    expect(outcomeOfError(new TypeError('fetch failed'))).toEqual({ kind: 'offline' })
    expect(outcomeOfError({ statusCode: 503, data: { message: 'db away' } })).toEqual({ kind: 'offline' })
    expect(outcomeOfError({ statusCode: 403, data: { statusCode: 403, message: 'not yours' } })).toEqual({ kind: 'refused', statusCode: 403, message: 'not yours' })
    expect(outcomeOfError({ statusCode: 409, data: { statusCode: 409, message: 'archived' } })).toEqual({ kind: 'refused', statusCode: 409, message: 'archived' })
  })

  it('retries with a growing delay, capped', () => {
    expect([1, 2, 3, 4, 5, 6, 10].map(retryDelayMs)).toEqual([1000, 2000, 4000, 8000, 16000, 30000, 30000])
  })
})
