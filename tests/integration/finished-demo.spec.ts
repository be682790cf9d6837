// The demo seed's finished song: a newcomer finds a sealed final sheet with its split sheet.
import { WebVTTParser } from 'webvtt-parser'
import { describe, expect, it } from 'vitest'
import { asDemo } from '../support/http'

describe('the finished demo song', () => {
  it('is sealed, with a confirmed split sheet and working exports', async () => {
    const listener = await asDemo('listener')
    const [crew] = (await listener.get('/api/crews')).body
    const songs = (await listener.get(`/api/crews/${crew.id}/songs`)).body
    const song = songs.find((s: any) => s.title === 'Kell Street Lanterns')
    expect(song).toBeTruthy()
    const { seal } = (await listener.get(`/api/songs/${song.id}/seal`)).body
    expect(seal).toMatchObject({ versionNumber: 2, lifted: null })
    expect(seal.signers).toHaveLength(3)
    expect(seal.split.reduce((t: number, s: any) => t + s.shareBp, 0)).toBe(10_000)
    expect((await listener.get(`/api/versions/${seal.versionId}`)).body.sealed).toBe(true)
    const split = (await listener.get(`/api/songs/${song.id}/split`)).body
    expect(split).toMatchObject({ ready: true, locked: true, totalBp: 10_000 })

    const sheet = (await listener.get(`/api/versions/${seal.versionId}/sheet`)).body
    expect(sheet.omitted).toBe(1)
    expect(sheet.sections.map((s: any) => s.heading)).toEqual(['Intro', 'Hook', 'Verse 1', 'Hook'])
    const vtt = await listener.get(`/api/versions/${seal.versionId}/sheet.vtt`)
    // W3C WebVTT, checked by the npm webvtt-parser.
    const tree = new WebVTTParser().parse(vtt.text, 'metadata')
    expect(tree.errors).toEqual([])
    expect(tree.cues).toHaveLength(34)
    // Bar 5 at 88 BPM with a 120 ms lead-in: 0.12 + 4 × 240 / 88 s (DOMAIN.md §1 formula).
    expect(Math.round(tree.cues[2].startTime * 1000)).toBe(Math.round(120 + 4 * 240_000 / 88))
    // Its sections are rows of the song (as the beat room makes them), and the sealed document's blocks point at them.
    const sections = (await listener.get(`/api/songs/${song.id}/sections`)).body
    expect(sections.map((s: any) => [s.kind, s.startBar, s.endBar])).toEqual([['intro', 1, 4], ['hook', 5, 12], ['verse', 13, 28], ['hook', 29, 36]])
    const version = (await listener.get(`/api/versions/${seal.versionId}`)).body
    expect(version.doc.content.map((b: any) => b.attrs.sectionId)).toEqual(sections.map((s: any) => s.id))
    const activity = (await listener.get(`/api/songs/${song.id}/activity`)).body
    expect(activity.map((a: any) => a.kind).slice(0, 5)).toEqual(['seal', 'signoff.approved', 'signoff.approved', 'signoff.approved', 'signoff.requested'])
  })
})
