// The prosody contract over HTTP (DESIGN.md: POST /api/analysis, GET /api/rhymes), the crew
// lexicon used at once by both, membership checks, input limits and bad input (4xx, never 5xx).
import { beforeAll, describe, expect, it } from 'vitest'
import { ANALYSIS_LIMITS } from '../../shared/schemas/prosody'
import { makeCrew, type TestCrew } from '../support/people'

let crew: TestCrew
let other: TestCrew
beforeAll(async () => {
  crew = await makeCrew()
  other = await makeCrew()
})

const lines = [
  { id: 'l1', bar: 1, text: 'Night bus home, I\'m ridin\' with the window down (skrrt)' },
  { id: 'l2', bar: 2, text: 'Streetlight glow on the 808 in my town' },
  { id: 'l3', bar: 3, text: 'zorbly flows' },
]

describe('POST /api/analysis', () => {
  it('answers the contract shape', async () => {
    const res = await crew.as.listener.post('/api/analysis', { lines, grid: { bpm: 90, beatsPerBar: 4 } })
    expect(res.status).toBe(200)
    const body = res.body
    expect(body.lines).toHaveLength(3)
    for (const line of body.lines) {
      expect(line).toMatchObject({ id: expect.any(String), bar: expect.any(Number), syllables: expect.any(Number) })
      for (const w of line.words) {
        expect(w).toMatchObject({ text: expect.any(String), syllables: expect.any(Number), stress: expect.stringMatching(/^[012]*$/) })
        expect(['dictionary', 'lexicon', 'guess']).toContain(w.source)
        expect(w.stress.length).toBe(w.syllables)
      }
    }
    expect(body.bars.map((b: { bar: number }) => b.bar)).toEqual([1, 2, 3])
    for (const b of body.bars) expect(b).toMatchObject({ bar: expect.any(Number), syllables: expect.any(Number), syllablesPerBeat: expect.any(Number), overPacked: expect.any(Boolean) })
    expect(body.scheme).toHaveLength(3)
    for (const f of body.families) {
      expect(['perfect', 'near', 'multi']).toContain(f.kind)
      for (const w of f.words) {
        // `index` is the word's position in its line's `words`
        const line = body.lines.find((l: { id: string }) => l.id === w.lineId)
        expect(line.words[w.index].text).toBe(w.text)
      }
    }
    // down/town end both lines: one family, same scheme letter
    expect(body.scheme[0]).toBe(body.scheme[1])
    const l1 = body.lines[0]
    expect(l1.words.at(-1)).toMatchObject({ text: 'skrrt', isAdlib: true })
    expect(l1.adlibSyllables).toBe(1)
    expect(body.lines[1].words.find((w: { text: string }) => w.text === '808')).toMatchObject({ syllables: 3, source: 'dictionary' })
    expect(body.lines[2].words[0]).toMatchObject({ text: 'zorbly', source: 'guess' })
  })

  it('sends every pronunciation only when asked (detail: "full" or ?detail=full)', async () => {
    const slim = await crew.as.writer.post('/api/analysis', { lines })
    const word = slim.body.lines[1].words.find((w: { text: string }) => w.text === '808')
    // CMU Pronouncing Dictionary: eight EY1 T, oh OW1; a lone consonant between vowels opens the next syllable (maximal onset, common practice)
    expect(word).toMatchObject({ phones: ['EY1', 'T', 'OW1', 'EY1', 'T'], syllableSplit: [1, 2, 2], start: expect.any(Number), end: expect.any(Number) })
    expect(word.pronunciations).toBeUndefined()
    for (const full of [await crew.as.writer.post('/api/analysis', { lines, detail: 'full' }), await crew.as.writer.post('/api/analysis?detail=full', { lines })]) {
      expect(full.status).toBe(200)
      const w = full.body.lines[1].words.find((x: { text: string }) => x.text === '808')
      expect(w).toMatchObject({ pronunciations: [['EY1', 'T', 'OW1', 'EY1', 'T']], method: 'number', syllableParts: [{ phones: ['EY1'], stress: 1 }, { phones: ['T', 'OW1'], stress: 1 }, { phones: ['EY1', 'T'], stress: 1 }] })
      expect(full.body.scheme).toEqual(slim.body.scheme)
    }
    const bad = await crew.as.writer.post('/api/analysis', { lines, detail: 'everything' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields.detail).toMatch(/full/)
    expect((await crew.as.writer.post('/api/analysis?detail=x', { lines })).status).toBe(400)
  })

  it('compresses the answer when the client accepts it, to the same JSON', async () => {
    // HTTP content codings (RFC 9110 §8.4): br (RFC 7932) preferred, then gzip, else none
    const body = JSON.stringify({ lines })
    const plain = await crew.as.writer.request('POST', '/api/analysis', body, { 'content-type': 'application/json', 'accept-encoding': 'identity' })
    expect(plain.headers.get('content-encoding')).toBeNull()
    for (const [accept, coding] of [['gzip, deflate, br', 'br'], ['gzip', 'gzip'], ['br;q=0, gzip', 'gzip'], ['br, gzip;q=0.5', 'br']]) {
      const res = await crew.as.writer.request('POST', '/api/analysis', body, { 'content-type': 'application/json', 'accept-encoding': accept })
      expect(res.status).toBe(200)
      expect(res.headers.get('content-encoding'), accept).toBe(coding)
      expect(res.headers.get('vary')).toMatch(/accept-encoding/i)
      expect(res.body).toEqual(plain.body)
    }
  })

  it('returns density per section when sections are given', async () => {
    const res = await crew.as.writer.post('/api/analysis', { lines, sections: [{ id: 's1', startBar: 1, endBar: 2, kind: 'verse', label: 'Verse 1' }] })
    expect(res.status).toBe(200)
    expect(res.body.sections[0]).toMatchObject({ id: 's1', lineIds: ['l1', 'l2'], rhymeDensity: expect.any(Number) })
  })

  it('applies the crew lexicon at once, and only for members', async () => {
    const word = 'zorbly'
    const before = await crew.as.writer.post('/api/analysis', { lines, crewId: crew.crewId })
    expect(before.body.lines[2].words[0].source).toBe('guess')
    const taught = await crew.as.writer.post(`/api/crews/${crew.crewId}/lexicon`, { word, phones: 'Z AO1 R B AH0 L IY0' })
    expect(taught.status).toBe(201)
    expect(taught.body).toMatchObject({ word, syllables: 3, stress: '100' })
    const after = await crew.as.listener.post('/api/analysis', { lines, crewId: crew.crewId })
    expect(after.body.lines[2].words[0]).toMatchObject({ text: 'zorbly', syllables: 3, source: 'lexicon' })
    // Without crewId the lexicon is not applied
    const plain = await crew.as.listener.post('/api/analysis', { lines })
    expect(plain.body.lines[2].words[0].source).toBe('guess')
    // Another crew's id: 404, as if it did not exist
    const outsider = await other.as.owner.post('/api/analysis', { lines, crewId: crew.crewId })
    expect(outsider.status).toBe(404)
    expect(outsider.body.message).toMatch(/not found/i)
    expect((await crew.as.owner.post(`/api/crews/${crew.crewId}/lexicon`, { word: 'glowlee', soundsLike: 'glow lee' })).status).toBe(201)
    const rhymes = await crew.as.listener.get(`/api/rhymes?q=holy&crewId=${crew.crewId}`)
    expect(rhymes.body.perfect[0]).toEqual({ word: 'glowlee', syllables: 2, lexicon: true })
    const outsiderRhymes = await other.as.owner.get(`/api/rhymes?q=holy&crewId=${crew.crewId}`)
    expect(outsiderRhymes.status).toBe(404)
  })

  it('refuses too many lines or too large a body with 413, long lines with 400', async () => {
    const many = Array.from({ length: ANALYSIS_LIMITS.lines + 1 }, (_, i) => ({ id: `x${i}`, bar: 1, text: 'a' }))
    const tooMany = await crew.as.writer.post('/api/analysis', { lines: many })
    expect(tooMany.status).toBe(413)
    expect(tooMany.body.message).toMatch(/at most 400 lines/)
    const big = await crew.as.writer.post('/api/analysis', { lines: [{ id: 'a', bar: 1, text: 'x' }], pad: 'y'.repeat(ANALYSIS_LIMITS.bodyBytes) })
    expect(big.status).toBe(413)
    const long = await crew.as.writer.post('/api/analysis', { lines: [{ id: 'a', bar: 1, text: 'la '.repeat(200) }] })
    expect(long.status).toBe(400)
    expect(long.body.data.fields['lines.0.text']).toMatch(/under 300 characters/)
  })

  it('answers bad input with 4xx and a message, never 5xx', async () => {
    const bodies: unknown[] = [
      {}, { lines: 'nope' }, { lines: [{}] }, { lines: [{ id: 'a', bar: 0, text: 'x' }] }, { lines: [{ id: 'a', bar: 1.5, text: 'x' }] },
      { lines: [{ id: 'a', bar: 1, text: 7 }] }, { lines: [], grid: { bpm: 'fast', beatsPerBar: 4 } }, { lines: [], grid: { bpm: 90, beatsPerBar: 0 } },
      { lines: [], crewId: 'not-a-uuid' }, { lines: [], sections: [{ id: 's', startBar: 4, endBar: 2 }] }, [1, 2], null,
      { lines: [{ id: 'a', bar: 1, text: '\u0000\uD800(((' }] },
    ]
    for (const b of bodies) {
      const res = await crew.as.writer.request('POST', '/api/analysis', JSON.stringify(b), { 'content-type': 'application/json' })
      if (res.status === 200) continue // a lone surrogate or empty list is still valid input
      expect(res.status, JSON.stringify(b)).toBeGreaterThanOrEqual(400)
      expect(res.status, JSON.stringify(b)).toBeLessThan(500)
      expect(res.body.message).toEqual(expect.any(String))
    }
    expect((await crew.as.writer.request('POST', '/api/analysis', '{"lines": [', { 'content-type': 'application/json' })).status).toBe(400)
    expect((await crew.as.writer.request('POST', '/api/analysis', 'lines', { 'content-type': 'text/plain' })).status).toBe(415)
    expect((await crew.as.anonymous.post('/api/analysis', { lines })).status).toBe(401)
    for (const q of ['', '?q=', `?q=${'a'.repeat(61)}`, '?q=one%20two%20three%20four%20five', '?q=day&limit=0', '?q=day&limit=x', '?q=day&crewId=nope']) {
      const res = await crew.as.writer.get(`/api/rhymes${q}`)
      expect(res.status, q).toBe(400)
      expect(res.body.message).toEqual(expect.any(String))
    }
  })
})

describe('GET /api/rhymes', () => {
  it('answers perfect, near and multi lists of { word, syllables }', async () => {
    const res = await crew.as.cowriter.get('/api/rhymes?q=money')
    expect(res.status).toBe(200)
    for (const key of ['perfect', 'near', 'multi']) {
      expect(Array.isArray(res.body[key])).toBe(true)
      for (const c of res.body[key]) expect(c).toMatchObject({ word: expect.any(String), syllables: expect.any(Number) })
    }
    expect(res.body.perfect.map((c: { word: string }) => c.word)).toContain('funny')
    expect(res.body.groups.perfect[0]).toMatchObject({ syllables: expect.any(Number), words: expect.any(Array) })
  })
})

describe('crew lexicon', () => {
  it('creates by ARPAbet or respelling, lists, edits and deletes', async () => {
    const c = crew.as.cowriter
    const base = `/api/crews/${crew.crewId}/lexicon`
    const made = await c.post(base, { word: 'Skrrtt', soundsLike: 'skirt' })
    expect(made.status).toBe(201)
    // CMU Pronouncing Dictionary: skirt S K ER1 T
    expect(made.body).toMatchObject({ word: 'skrrtt', phones: 'S K ER1 T', soundsLike: 'skirt', syllables: 1 })
    const dup = await c.post(base, { word: 'skrrtt', phones: 'S K ER1 T' })
    expect(dup.status).toBe(409)
    const list = await crew.as.listener.get(base)
    expect(list.body.map((e: { word: string }) => e.word)).toContain('skrrtt')
    const edited = await c.patch(`${base}/${made.body.id}`, { phones: 's k er1 t ih0 t' })
    expect(edited.body).toMatchObject({ phones: 'S K ER1 T IH0 T', syllables: 2, soundsLike: null })
    const a = await c.post('/api/analysis', { lines: [{ id: 'a', bar: 1, text: 'skrrtt' }], crewId: crew.crewId })
    expect(a.body.lines[0].syllables).toBe(2)
    expect((await crew.as.listener.delete(`${base}/${made.body.id}`)).status).toBe(403)
    expect((await other.as.owner.delete(`/api/crews/${crew.crewId}/lexicon/${made.body.id}`)).status).toBe(404)
    expect((await c.delete(`${base}/${made.body.id}`)).status).toBe(204)
    expect((await c.delete(`${base}/${made.body.id}`)).status).toBe(404)
  })

  it('validates phones against the 39 ARPAbet phones and respellings against the dictionary', async () => {
    const base = `/api/crews/${crew.crewId}/lexicon`
    const cases: Array<[unknown, string]> = [
      [{ word: 'qx', phones: 'S K ER T' }, 'phones'],
      [{ word: 'qx', phones: 'S K XX1 T' }, 'phones'],
      [{ word: 'qx', phones: 'S1 K ER1' }, 'phones'],
      [{ word: 'qx', phones: 'S K' }, 'phones'],
      [{ word: 'qx', soundsLike: 'zzqqxx' }, 'soundsLike'],
      [{ word: 'qx' }, 'phones'],
      [{ word: 'qx', phones: 'K W AH1', soundsLike: 'kwa' }, 'phones'],
      [{ word: 'two words', phones: 'T UW1' }, 'word'],
      [{ word: '808', phones: 'EY1 T' }, 'word'],
      [{ word: 'x'.repeat(41), phones: 'EH1 K S' }, 'word'],
    ]
    for (const [body, field] of cases) {
      const res = await crew.as.writer.post(base, body)
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.data.fields[field], JSON.stringify(body)).toEqual(expect.any(String))
    }
  })
})
