import { createHash } from 'node:crypto'
import { asc, eq, sql } from 'drizzle-orm'
import { LRUCache } from 'lru-cache'
import type { H3Event } from 'h3'
import { parsePhones, stressPattern, syllableCount } from '../../shared/utils/arpabet'
import { lexiconEntries, type LexiconEntry } from '../database/schema'
import { resolveWord, type Lexicon } from './prosody/resolve'
import { tokenize } from './prosody/tokenize'

// Read on every analysis with a crew: prepared once (drizzle builds the SQL once, not per call).
let prepared: ReturnType<typeof prepareLexiconQuery> | null = null
function prepareLexiconQuery() {
  return useDb().select({ word: lexiconEntries.word, phones: lexiconEntries.phones })
    .from(lexiconEntries).where(eq(lexiconEntries.crewId, sql.placeholder('crewId'))).orderBy(asc(lexiconEntries.word))
    .prepare('barsmith_lexicon_of_crew')
}
const lexiconQuery = () => (prepared ??= prepareLexiconQuery())

// Lexicons by crew, kept until that crew's entries change: every change goes through
// `lexiconChanged`, which drops the entry here at once and, through NOTIFY, on every other
// server instance (a lost LISTEN connection drops them all).
const byCrew = new LRUCache<string, Lexicon>({ max: 1000 })
// Bumped on every change, so a read that raced with a change is not kept.
let generation = 0
const CHANNEL = 'barsmith_lexicon'
let subscribed = false

function subscribe() {
  if (subscribed) return
  subscribed = true
  void listenTo(CHANNEL, (crewId) => {
    generation++
    byCrew.delete(crewId)
  })
  onListenerReconnect(() => {
    generation++
    byCrew.clear()
  })
}

/**
 * A crew's lexicon as the prosody engine reads it: word → pronunciations, with `version` a
 * digest of every entry (the analysis keys its caches by it).
 */
export async function loadLexicon(crewId: string): Promise<Lexicon> {
  subscribe()
  const known = byCrew.get(crewId)
  if (known) return known
  const readAt = generation
  const rows = await lexiconQuery().execute({ crewId })
  const version = createHash('sha1').update(rows.map(r => `${r.word}=${r.phones}`).join('\n')).digest('base64url')
  const map = new Map<string, string[][]>()
  for (const r of rows) map.set(r.word, [r.phones.split(' ')])
  const lexicon: Lexicon = Object.assign(map, { version })
  if (readAt === generation) byCrew.set(crewId, lexicon)
  return lexicon
}

/** Call after a crew's lexicon entries changed (committed): every instance reads them afresh. */
export async function lexiconChanged(crewId: string) {
  generation++
  byCrew.delete(crewId)
  await useDb().execute(sql`SELECT pg_notify(${CHANNEL}, ${crewId})`)
}

/**
 * The signed-in user, and the lexicon of `crewId` when one is given (membership checked:
 * another crew answers 404).
 */
export async function lexiconFor(event: H3Event, crewId: string | undefined): Promise<Lexicon | undefined> {
  if (!crewId) {
    await requireUser(event)
    return undefined
  }
  await requireCrewAccess(event, crewId, 'lexicon.view')
  return loadLexicon(crewId)
}

function fieldError(field: string, message: string) {
  return createError({ statusCode: 400, message, data: { fields: { [field]: message } } })
}

/**
 * The ARPAbet to store for a taught word: typed phones, validated against the 39 ARPAbet
 * phones, or a respelling made only of words the dictionary knows ("skirt", "sky tree").
 */
export function taughtPhones(input: { phones?: string, soundsLike?: string }): { phones: string, soundsLike: string | null } {
  if (input.phones) {
    const check = parsePhones(input.phones)
    if (!check.ok) throw fieldError('phones', check.message)
    return { phones: check.phones.join(' '), soundsLike: null }
  }
  const words = tokenize(input.soundsLike ?? '').flatMap(t => t.spoken)
  if (!words.length) throw fieldError('soundsLike', 'Type dictionary words that sound like it, e.g. "skirt".')
  const phones: string[] = []
  for (const w of words) {
    const r = resolveWord(w)
    if (r.source !== 'dictionary') throw fieldError('soundsLike', `"${w}" is not in the dictionary; respell with words it knows, or type ARPAbet.`)
    // Like a compound, the first stressed word keeps the main stress (glow lee → G L OW1 L IY2).
    const primarySeen = phones.some(ph => ph.endsWith('1'))
    phones.push(...r.prons[0]!.map(ph => (primarySeen && ph.endsWith('1') ? `${ph.slice(0, -1)}2` : ph)))
  }
  if (phones.length > 40) throw fieldError('soundsLike', 'That respelling is too long for one word.')
  return { phones: phones.join(' '), soundsLike: input.soundsLike!.trim() }
}

/** One entry as the API shows it, with its syllable count and stress. */
export function lexiconJson(row: LexiconEntry) {
  const phones = row.phones.split(' ')
  return {
    id: row.id,
    word: row.word,
    phones: row.phones,
    soundsLike: row.soundsLike,
    syllables: syllableCount(phones),
    stress: stressPattern(phones),
    createdBy: row.createdBy,
    createdAt: row.createdAt,
    updatedAt: row.updatedAt,
  }
}

/** The crew's entries, alphabetical. */
export function listLexicon(crewId: string) {
  return useDb().select().from(lexiconEntries).where(eq(lexiconEntries.crewId, crewId)).orderBy(asc(lexiconEntries.word))
}
