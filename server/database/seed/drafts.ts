import { eq } from 'drizzle-orm'
import { docFromLines, type LyricLine, type SectionRef } from '../../../shared/utils/lyric-doc'
import type { DbOrTx } from '../../utils/db'
import { altComments, alts, altVotes, drafts, notifications, sections, versions } from '../schema'
import type { DemoPeople } from './people'

// An invented lyric for the invented demo song, one line per bar in 4/4, on the sections the
// beat step marked: an 8-bar hook on bars 5–12, then a 16-bar verse on bars 13–28 (common
// practice: hook 8, verse 16).
const HOOK: Array<[string, string]> = [
  ['nbh-h1', 'Last bus humming, window fogged with my name'],
  ['nbh-h2', 'Streetlights counting every stop the same'],
  ['nbh-h3', 'Head on the glass while the city rolls slow'],
  ['nbh-h4', 'Night bus home, only place that I know'],
  ['nbh-h5', 'Last bus humming, window fogged with my name'],
  ['nbh-h6', 'Driver don\'t talk but he knows why I came'],
  ['nbh-h7', 'Ticket in my pocket like a promise I keep'],
  ['nbh-h8', 'Night bus home, I can ride it in my sleep'],
]
const VERSE: Array<[string, string]> = [
  ['nbh-v1', 'Shift ran long, I got flour on my sleeves'],
  ['nbh-v2', 'Boss said thanks like the word was a squeeze'],
  ['nbh-v3', 'Walked past the corner where the old store stood'],
  ['nbh-v4', 'Now it\'s a gym full of people looking good'],
  ['nbh-v5', 'Ten minutes late so the schedule\'s a guess'],
  ['nbh-v6', 'I count the coins in my coat, nothing less'],
  ['nbh-v7', 'Bench still wet from the rain at eleven'],
  ['nbh-v8', 'Puddles hold the signs like a cheap kind of heaven'],
  ['nbh-v9', 'Here come the lights round the bend by the bridge'],
  ['nbh-v10', 'Same old number and the same rattled hinge'],
  ['nbh-v11', 'Tap my card, get the beep, find a seat in the back'],
  ['nbh-v12', 'Lady with the groceries, a kid with a snack'],
  ['nbh-v13', 'Every stop a story that I never get to read'],
  ['nbh-v14', 'Every face a chapter moving faster than me'],
  ['nbh-v15', 'So I write on my phone while the engine hums low'],
  ['nbh-v16', 'Bars for the ride, \'cause the ride\'s all I owe'],
]

const onBars = (rows: Array<[string, string]>, firstBar: number): LyricLine[] => rows.map(([id, text], i) => ({ id, bar: firstBar + i, text }))

const hoursAgo = (h: number) => new Date(Date.now() - h * 3_600_000)

/**
 * The demo song's drafts: a main draft with four versions by the writer and the owner and
 * an open alt by the co-writer (a vote and a comment on it), plus a second draft copied from
 * the main one, so a newcomer sees history, diffs and alts at once.
 */
export async function seedDrafts(tx: DbOrTx, people: DemoPeople, song: { songId: string }) {
  const [main] = await tx.insert(drafts).values({ songId: song.songId, name: 'Main', isMain: true, createdBy: people.writer.id, createdAt: hoursAgo(80) }).returning()
  const songSections: SectionRef[] = await tx.select({ id: sections.id, kind: sections.kind, label: sections.label, startBar: sections.startBar, endBar: sections.endBar })
    .from(sections).where(eq(sections.songId, song.songId))
  let parentId: string | null = null
  let number = 0
  const save = async (draftId: string, authorId: string, kind: 'save' | 'copy', note: string, hook: LyricLine[], verse: LyricLine[], at: Date) => {
    const [v] = await tx.insert(versions).values({
      draftId, number: ++number, parentId, authorId, kind, note, doc: docFromLines([...hook, ...verse], songSections), lines: [...hook, ...verse], createdAt: at,
    }).returning({ id: versions.id })
    parentId = v!.id
    await tx.update(drafts).set({ headVersionId: v!.id, updatedAt: at }).where(eq(drafts.id, draftId))
    return v!.id
  }

  const hookFirst = onBars(HOOK, 5).map(l =>
    l.id === 'nbh-h6' ? { ...l, text: 'Nobody talking, everybody the same' } : l.id === 'nbh-h8' ? { ...l, text: 'Night bus home, rocking me to sleep' } : l)
  const hook = onBars(HOOK, 5)
  const verse = onBars(VERSE, 13)
  const verseEarly = verse.slice(0, 8).map(l => (l.id === 'nbh-v5' ? { ...l, text: 'Ten minutes late and the board is a guess' } : l))

  await save(main!.id, people.writer.id, 'save', 'Hook sketch', hookFirst, [], hoursAgo(78))
  await save(main!.id, people.writer.id, 'save', 'First half of the verse', hookFirst, verseEarly, hoursAgo(54))
  const v3 = await save(main!.id, people.owner.id, 'save', 'Reworded hook lines 6 and 8', hook, verseEarly, hoursAgo(30))
  const v4 = await save(main!.id, people.writer.id, 'save', 'Verse done', hook, verse, hoursAgo(5))

  // An open alt by the co-writer on verse line 6 (bar 18), with a vote and a comment from the producer.
  const line = verse.find(l => l.id === 'nbh-v6')!
  const [alt] = await tx.insert(alts).values({
    draftId: main!.id, lineId: line.id, lineText: line.text, baseVersionId: v4, text: 'Coins in my coat and a song to confess', authorId: people.cowriter.id, createdAt: hoursAgo(3),
  }).returning()
  await tx.insert(altVotes).values({ altId: alt!.id, userId: people.producer.id, value: 1 })
  await tx.insert(altComments).values({ altId: alt!.id, authorId: people.producer.id, body: 'Confess sets up the back half nicely.', createdAt: hoursAgo(2) })
  await tx.insert(notifications).values({
    userId: people.writer.id, kind: 'alt.proposed', songId: song.songId, draftId: main!.id, altId: alt!.id, actorId: people.cowriter.id,
    title: 'New alt on your line in “Night Bus Home”',
    body: `${people.cowriter.name} proposed “${alt!.text}” for bar ${line.bar} (“${line.text}”) in the draft “Main”.`,
    url: `/songs/${song.songId}?draft=${main!.id}&line=${line.id}`,
    createdAt: hoursAgo(3),
  })

  // A second draft, copied from version 3, with a slower hook idea.
  const [slow] = await tx.insert(drafts).values({ songId: song.songId, name: 'Hook, slower take', createdBy: people.writer.id, createdAt: hoursAgo(20) }).returning()
  parentId = null
  number = 0
  await save(slow!.id, people.writer.id, 'copy', `Copied from "Main" version 3`, hook, verseEarly, hoursAgo(20))
  const slowHook = hook.map(l => (l.id === 'nbh-h3' ? { ...l, text: 'Head on the glass, let the whole city go slow' } : l.id === 'nbh-h7' ? { ...l, text: 'Ticket in my pocket, it\'s the one thing I keep' } : l))
  await save(slow!.id, people.writer.id, 'save', 'Stretched hook lines 3 and 7', slowHook, verseEarly, hoursAgo(19))
  return { mainDraftId: main!.id, altId: alt!.id, v3 }
}
