// The final sheet's exports, each checked by something outside Barsmith: WebVTT by the npm
// webvtt-parser, the PDF by Debian's pdftotext and pdffonts (poppler-utils).
import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { WebVTTParser } from 'webvtt-parser'
import { beforeAll, describe, expect, it } from 'vitest'
import { docFromLines } from '../../shared/utils/lyric-doc'
import { makeCrew, type TestCrew } from '../support/people'
import { draftWithLines, sealedSong, type TestLine } from '../support/finish'

let crew: TestCrew
beforeAll(async () => {
  crew = await makeCrew()
})

const LINES: TestLine[] = [
  { id: 'i1', bar: 1, text: '(check, check) lanterns on' },
  { id: 'h1', bar: 2, text: 'Tide comes in on the quarter note' },
  { id: 'h2', bar: 3, text: 'I count it twice and I keep it close' },
  { id: 'h3', bar: 4, text: 'a line the producer cut', out: true },
  { id: 'h4', bar: 4, text: 'harbour lights in a row' },
  { id: 'v1', bar: 9, text: 'second verse after four open bars' },
  { id: 'v2', bar: 10, text: 'two short ones' },
  { id: 'v3', bar: 10, text: 'share a bar (yeah)' },
]
const PERFORMED = LINES.filter(l => !l.out)
const SECTIONS = [
  { id: 'sec-intro', kind: 'intro', startBar: 1, endBar: 1 },
  { id: 'sec-hook', kind: 'hook', label: 'Hook', startBar: 2, endBar: 8 },
  { id: 'sec-verse', kind: 'verse', label: 'Verse 1', startBar: 9, endBar: 24 },
]

/** The grid formula of DOMAIN.md §1, written out again: offset + (bar − 1) × bars per lyric bar × beats × 60 000 / BPM, in ms. */
const barMs = (g: { bpm: number, beatsPerBar: number, offsetMs: number, half?: boolean }, bar: number) =>
  g.offsetMs + (bar - 1) * (g.half ? 2 : 1) * g.beatsPerBar * 60_000 / g.bpm

async function songWithSections(grid: { bpm: number, beatsPerBar: number, offsetMs: number, feel: 'normal' | 'half' }) {
  const d = await draftWithLines(crew, [{ id: 'x', bar: 1, text: 'placeholder' }], grid)
  const doc = docFromLines(LINES, SECTIONS)
  const res = await crew.as.writer.post(`/api/drafts/${d.draftId}/versions`, { baseVersionId: d.versionId, lines: LINES, doc })
  expect(res.status, res.text).toBe(201)
  return { ...d, versionId: res.body.id as string }
}

function pdfText(buffer: Buffer, layout = true): string {
  const dir = mkdtempSync(join(tmpdir(), 'sheet-'))
  const file = join(dir, 'sheet.pdf')
  writeFileSync(file, buffer)
  return execFileSync('pdftotext', [...(layout ? ['-layout'] : []), file, '-'], { encoding: 'utf8' })
}

function inOrder(haystack: string, needles: string[]) {
  const flat = haystack.replace(/\s+/g, ' ')
  let from = 0
  for (const n of needles) {
    const at = flat.indexOf(n.replace(/\s+/g, ' '), from)
    expect(at, `"${n}" after position ${from}`).toBeGreaterThan(-1)
    from = at + n.length
  }
}

describe('WebVTT export', () => {
  it('is valid WebVTT with one cue per performed line, timed by the grid formula', async () => {
    const grid = { bpm: 90, beatsPerBar: 4, offsetMs: 0, feel: 'normal' as const }
    const { versionId } = await songWithSections(grid)
    const res = await crew.as.listener.get(`/api/versions/${versionId}/sheet.vtt`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toContain('text/vtt')
    // W3C WebVTT §4, validated by the general-purpose npm webvtt-parser.
    const tree = new WebVTTParser().parse(res.text, 'metadata')
    expect(tree.errors).toEqual([])
    expect(res.text.startsWith('WEBVTT')).toBe(true)
    expect(tree.cues.map((c: any) => c.text)).toEqual(PERFORMED.map(l => l.text))
    const starts = tree.cues.map((c: any) => Math.round(c.startTime * 1000))
    // Lines v2 and v3 share bar 10: each takes half of it.
    const expected = [1, 2, 3, 4, 9, 10, 10.5].map(b => Math.round(barMs(grid, 1) + (b - 1) * 4 * 60_000 / 90))
    expect(starts).toEqual(expected)
    // DOMAIN.md §6 check value: 8/3 s → 00:00:02.667 (bar 2 at 90 BPM).
    expect(res.text).toContain('00:00:02.667 --> 00:00:05.333')
    // The line before the open bars ends with its own bar, not when the next line starts.
    expect(tree.cues[3].endTime).toBeCloseTo(barMs(grid, 5) / 1000, 3)
    expect(res.text).not.toContain('the producer cut')
  })

  it('rounds each cue from the exact bar time under an offset and a half-time feel', async () => {
    const grid = { bpm: 140, beatsPerBar: 4, offsetMs: 312.5, feel: 'half' as const }
    const { versionId } = await songWithSections(grid)
    const res = await crew.as.writer.get(`/api/versions/${versionId}/sheet.vtt`)
    const tree = new WebVTTParser().parse(res.text, 'metadata')
    expect(tree.errors).toEqual([])
    const g = { ...grid, half: true }
    // A half-time lyric bar at 140 BPM spans two project bars: 24/7 s; never a sum of rounded bars.
    expect(tree.cues.map((c: any) => Math.round(c.startTime * 1000))).toEqual([1, 2, 3, 4, 9, 10, 10.5].map(b => Math.round(barMs(g, 1) + (b - 1) * 2 * 4 * 60_000 / 140)))
    expect(Math.round(tree.cues[4].startTime * 1000)).toBe(Math.round(312.5 + 8 * 2 * 4 * 60_000 / 140)) // 27 741.071… ms
  })
})

describe('PDF and plain-text exports', () => {
  it('renders a PDF with Literata embedded and every performed line in order, none marked out', async () => {
    const { versionId } = await songWithSections({ bpm: 90, beatsPerBar: 4, offsetMs: 0, feel: 'normal' })
    const res = await fetch(new URL(`/api/versions/${versionId}/sheet.pdf`, crew.as.listener.baseUrl), { headers: { cookie: crew.as.listener.cookieHeader } })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('application/pdf')
    const pdf = Buffer.from(await res.arrayBuffer())
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
    // Debian poppler-utils: pdftotext reads the text back, pdffonts lists the embedded fonts.
    const text = pdfText(pdf)
    inOrder(text, PERFORMED.map(l => l.text))
    expect(text).not.toContain('the producer cut')
    inOrder(text, ['HOOK', 'Tide comes in', 'VERSE 1', 'second verse'])
    const dir = mkdtempSync(join(tmpdir(), 'fonts-'))
    writeFileSync(join(dir, 'a.pdf'), pdf)
    const fonts = execFileSync('pdffonts', [join(dir, 'a.pdf')], { encoding: 'utf8' })
    expect(fonts).toMatch(/Literata-Regular\s+CID TrueType\s+Identity-H\s+yes/)
    expect(fonts).toMatch(/Literata-Italic/)
  })

  it('prints plain text with bar numbers and times', async () => {
    const { versionId } = await songWithSections({ bpm: 90, beatsPerBar: 4, offsetMs: 0, feel: 'normal' })
    const res = await crew.as.listener.get(`/api/versions/${versionId}/sheet.txt`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toContain('text/plain')
    expect(res.text).toMatch(/^ {3}2 {3}0:02 {2}Tide comes in on the quarter note$/m)
    expect(res.text).toMatch(/^ {3}9 {3}0:21 {2}second verse after four open bars$/m)
    expect(res.text).toContain('[HOOK]')
    expect(res.text).not.toContain('the producer cut')
    expect(res.text).toContain('(not sealed)')
  })

  it('carries the version number and seal date on every export of a sealed version', async () => {
    const s = await sealedSong(crew)
    const [version, seal] = await Promise.all([crew.as.listener.get(`/api/versions/${s.versionId}`), crew.as.listener.get(`/api/songs/${s.songId}/seal`)])
    expect(version.body.sealed).toBe(true)
    const label = `version 1, sealed ${String(seal.body.seal.sealedAt).slice(0, 10)}`
    const vtt = await crew.as.listener.get(`/api/versions/${s.versionId}/sheet.vtt`)
    expect(vtt.text.split('\n')[0]).toContain(label)
    expect(new WebVTTParser().parse(vtt.text, 'metadata').errors).toEqual([])
    expect((await crew.as.listener.get(`/api/versions/${s.versionId}/sheet.txt`)).text).toContain(label)
    const pdf = await fetch(new URL(`/api/versions/${s.versionId}/sheet.pdf`, crew.as.listener.baseUrl), { headers: { cookie: crew.as.listener.cookieHeader } })
    const text = pdfText(Buffer.from(await pdf.arrayBuffer()), false)
    expect(text.replace(/\s+/g, ' ')).toContain(label)
    expect(text).toContain('Split sheet')
    expect(text).toContain('Not legal advice')
  })

  it('answers unknown or malformed version ids with 404 JSON', async () => {
    for (const path of ['/api/versions/not-a-uuid/sheet.pdf', '/api/versions/00000000-0000-0000-0000-000000000000/sheet.vtt', '/api/versions/00000000-0000-0000-0000-000000000000/sheet.txt']) {
      const res = await crew.as.owner.get(path)
      expect(res.status, path).toBe(404)
      expect(res.body).toMatchObject({ statusCode: 404, message: expect.any(String) })
    }
  })
})
