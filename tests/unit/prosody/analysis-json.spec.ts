// The analysis response as JSON text: the cached word fragments must give the same value as
// serialising the analysis itself, the default detail must carry what the desk needs, and
// the response cache must follow the crew lexicon's version.
import { describe, expect, it } from 'vitest'
import { analyseDraft, analysisJson, wordsDetail } from '../../../server/utils/prosody/analyse'
import { analysisResponse } from '../../../server/utils/prosody/response'
import { splitByCounts } from '../../../shared/utils/arpabet'

const lines = [
  { id: 'a', bar: 1, text: 'They call me a poet and the people know it (yeah)' },
  { id: 'b', bar: 2, text: 'Sipping lemonade while I\'m plotting renegade ways' },
  { id: 'c', bar: 3, text: 'They call me a poet and the people know it (yeah)' },
  { id: 'd', bar: 3, text: 'my 808 since \'96, zorbly flows' },
]
const input = { lines, grid: { bpm: 90, beatsPerBar: 4 }, sections: [{ id: 's', startBar: 1, endBar: 2 }] }

describe('analysis JSON', () => {
  it('full detail is the analysis itself, word marks included', () => {
    const a = analyseDraft(input)
    expect(a.families.length).toBeGreaterThan(0)
    expect(JSON.parse(analysisJson(a, 'full'))).toEqual(JSON.parse(JSON.stringify(a)))
    // A second analysis of the same lines reuses the fragments and still marks its own families
    const again = analyseDraft({ lines: lines.slice(0, 2) })
    expect(JSON.parse(analysisJson(again, 'full'))).toEqual(JSON.parse(JSON.stringify(again)))
  })

  it('the default detail keeps the contract fields and drops the alternates', () => {
    const a = analyseDraft(input)
    const body = JSON.parse(analysisJson(a))
    expect(body.lines.map((l: { words: unknown[] }) => l.words)).toEqual(a.lines.map(l => l.words.map(w => JSON.parse(JSON.stringify(wordsDetail(w))))))
    const poet = body.lines[0].words[4]
    // CMU Pronouncing Dictionary: poet P OW1 AH0 T
    expect(poet).toMatchObject({ text: 'poet', syllables: 2, stress: '10', source: 'dictionary', phones: ['P', 'OW1', 'AH0', 'T'], start: 15, end: 19, isAdlib: false })
    expect(poet.pronunciations).toBeUndefined()
    expect(poet.multi).toEqual(expect.any(Array))
    // The split rebuilds the per-syllable parts of the full detail
    for (const [li, line] of a.lines.entries()) {
      for (const [wi, w] of line.words.entries()) expect(splitByCounts(w.phones, body.lines[li].words[wi].syllableSplit)).toEqual(w.syllableParts)
    }
    expect(body.scheme).toEqual(a.scheme)
    expect(body.sections).toEqual(JSON.parse(JSON.stringify(a.sections)))
  })
})

describe('response cache', () => {
  it('answers the same text for the same draft and lexicon version, and follows a new version at once', () => {
    const plain = analysisResponse(input, undefined, 'words')
    expect(analysisResponse(input, undefined, 'words')).toBe(plain) // the very same bytes, from the cache
    const v1 = Object.assign(new Map([['zorbly', [['Z', 'AO1', 'R', 'B', 'L', 'IY0']]]]), { version: 'v1' })
    const taught = JSON.parse(analysisResponse(input, v1, 'words'))
    expect(taught.lines[3].words.find((w: { text: string }) => w.text === 'zorbly')).toMatchObject({ source: 'lexicon', syllables: 2 })
    // The crew re-teaches the word: a new version is a new key, never the old answer
    const v2 = Object.assign(new Map([['zorbly', [['Z', 'AO1', 'R', 'B', 'AH0', 'L', 'IY0']]]]), { version: 'v2' })
    const retaught = JSON.parse(analysisResponse(input, v2, 'words'))
    expect(retaught.lines[3].words.find((w: { text: string }) => w.text === 'zorbly')).toMatchObject({ source: 'lexicon', syllables: 3 })
    // A lexicon without a version is never cached
    const loose = new Map([['zorbly', [['Z', 'AO1', 'R', 'L', 'IY0']]]])
    expect(JSON.parse(analysisResponse(input, loose, 'full')).lines[3].words.find((w: { text: string }) => w.text === 'zorbly').syllables).toBe(2)
    expect(JSON.parse(plain).lines[3].words.find((w: { text: string }) => w.text === 'zorbly').source).toBe('guess')
  })
})
