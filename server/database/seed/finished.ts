import { eq } from 'drizzle-orm'
import { docFromLines, type LyricLine, type SectionRef } from '../../../shared/utils/lyric-doc'
import type { DbOrTx } from '../../utils/db'
import { drafts, seals, sections, signoffRequests, signoffSigners, songs, splitLines, versions } from '../schema'
import type { DemoPeople } from './people'

export const FINISHED_SONG_TITLE = 'Kell Street Lanterns'

// Invented for the demo, every word. Hooks are written out each time so bar numbers stay true.
const HOOK = [
  'Lanterns hanging low on Kell Street',
  'copper in the wire and the rain on repeat',
  'every corner knows the way I count it',
  'four on the floor and I never doubt it (no)',
  'Lanterns hanging low on Kell Street',
  'paper in the gutter where the old tunes meet',
  'hold the note long till the night gives in',
  '(Kell Street) that\'s where the bars begin',
]

const VERSE = [
  'Woke up to the kettle and a borrowed beat',
  'bassline humming underneath my feet',
  'notebook on my knee and every margin full',
  'crossing out the easy rhymes, keeping what is true',
  'Tram bell ringing like it knows my name',
  'the same four bars but they never sound the same',
  'stack the syllables tight, then let them breathe',
  'leave a little room for the snare to speak',
  'Grandma said be patient, the city learns slow',
  'you get what you give and you give what you owe',
  'so I give it every verse, every take, every night',
  'till the lanterns on the corner flicker into light',
  'Ink on the sleeve and the rhythm in the chest',
  'we don\'t need a spotlight, the block knows the rest',
  'count it off one more time and let it land',
  'Kell Street lanterns, all of it by hand (by hand)',
]

// The song's sections, as rows (the map, the desk and the beat room read them) and in the document.
const SECTIONS = [
  { kind: 'intro', label: 'Intro', startBar: 1, endBar: 4 },
  { kind: 'hook', label: 'Hook', startBar: 5, endBar: 12 },
  { kind: 'verse', label: 'Verse 1', startBar: 13, endBar: 28 },
  { kind: 'hook', label: 'Hook', startBar: 29, endBar: 36 },
] as const

function kellLines(): LyricLine[] {
  const lines: LyricLine[] = [
    { id: 'kell-i1', bar: 1, text: '(Kell Street, late again, uh)' },
    { id: 'kell-i2', bar: 3, text: '(lanterns on, let it ride)' },
  ]
  HOOK.forEach((text, i) => lines.push({ id: `kell-h1-${i + 1}`, bar: 5 + i, text }))
  VERSE.forEach((text, i) => {
    // A first try at bar 21 the producer kept out of the booth.
    if (i === 8) lines.push({ id: 'kell-v1-alt', bar: 21, text: 'rain talk again, the forecast never ends' })
    lines.push({ id: `kell-v1-${i + 1}`, bar: 13 + i, text })
  })
  HOOK.forEach((text, i) => lines.push({ id: `kell-h2-${i + 1}`, bar: 29 + i, text }))
  return lines
}

const daysAgo = (d: number, hour = 20) => {
  const t = new Date(Date.now() - d * 86_400_000)
  t.setUTCHours(hour, 0, 0, 0)
  return t
}

/**
 * A second demo song that is already finished: two versions (the second marks one line out),
 * a sign-off every signer approved, the seal, and a confirmed split sheet — so a newcomer
 * sees a final sheet and its exports.
 */
export async function seedFinishedSong(tx: DbOrTx, people: DemoPeople) {
  const [song] = await tx.insert(songs).values({
    crewId: people.crewId, title: FINISHED_SONG_TITLE, createdBy: people.producer.id,
    bpm: 88, beatsPerBar: 4, offsetMs: 120, createdAt: daysAgo(12), updatedAt: daysAgo(4),
  }).returning()
  const sectionRows: SectionRef[] = await tx.insert(sections)
    .values(SECTIONS.map((x, position) => ({ ...x, songId: song!.id, position, createdBy: people.producer.id, createdAt: daysAgo(12) })))
    .returning({ id: sections.id, kind: sections.kind, label: sections.label, startBar: sections.startBar, endBar: sections.endBar })
  const [draft] = await tx.insert(drafts).values({ songId: song!.id, name: 'Main take', isMain: true, createdBy: people.writer.id, createdAt: daysAgo(12) }).returning()

  const first = kellLines()
  const [v1] = await tx.insert(versions).values({
    draftId: draft!.id, number: 1, authorId: people.writer.id, kind: 'save', note: 'Full take: intro, hook, verse, hook',
    doc: docFromLines(first, sectionRows), lines: first, createdAt: daysAgo(9),
  }).returning()
  const second = first.map(l => (l.id === 'kell-v1-alt' ? { ...l, out: true } : l))
  const [v2] = await tx.insert(versions).values({
    draftId: draft!.id, number: 2, parentId: v1!.id, authorId: people.producer.id, kind: 'save', note: 'Marked 1 line out',
    doc: docFromLines(second, sectionRows), lines: second, createdAt: daysAgo(6),
  }).returning()

  const split = [
    { userId: people.writer.id, name: people.writer.name, role: 'lyrics', shareBp: 4500 },
    { userId: people.producer.id, name: people.producer.name, role: 'music and production', shareBp: 3500 },
    { userId: people.cowriter.id, name: people.cowriter.name, role: 'lyrics', shareBp: 2000 },
  ]
  await tx.insert(splitLines).values(split.map((s, i) => ({ ...s, songId: song!.id, position: i, confirmedAt: daysAgo(5, 10 + i) })))

  const [request] = await tx.insert(signoffRequests).values({
    songId: song!.id, draftId: draft!.id, versionId: v2!.id, requestedBy: people.writer.id,
    note: 'Verse is locked; bar 21 stays as marked.', status: 'sealed', closedReason: 'Every signer approved', closedAt: daysAgo(4, 18), createdAt: daysAgo(5, 9),
  }).returning()
  const signers = [
    { person: people.writer, role: 'writer', comment: 'This is the one.', at: daysAgo(5, 12) },
    { person: people.producer, role: 'producer', comment: 'Bar 21 breathes now. Approved.', at: daysAgo(4, 15) },
    { person: people.cowriter, role: 'cowriter', comment: 'Happy with the second hook.', at: daysAgo(4, 18) },
  ]
  await tx.insert(signoffSigners).values(signers.map(s => ({ requestId: request!.id, userId: s.person.id, decision: 'approve' as const, comment: s.comment, decidedAt: s.at })))
  await tx.insert(seals).values({
    songId: song!.id, versionId: v2!.id, requestId: request!.id, sealedAt: daysAgo(4, 18),
    signers: signers.map(s => ({ userId: s.person.id, name: s.person.name, role: s.role, comment: s.comment, decidedAt: s.at.toISOString() })),
    split: split.map((s, i) => ({ ...s, confirmedAt: daysAgo(5, 10 + i).toISOString() })),
  })
  await tx.update(drafts).set({ headVersionId: v2!.id }).where(eq(drafts.id, draft!.id))
  return { songId: song!.id, versionId: v2!.id }
}
