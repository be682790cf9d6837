// The rhyme finder against the CMU Pronouncing Dictionary: every perfect candidate shares the
// query's rhyme part; identical rhymes are left out; common words (SCOWL levels) come first.
import { describe, expect, it } from 'vitest'
import { rhymePart } from '../../../shared/utils/arpabet'
import { commonnessLevel } from '../../../server/utils/prosody/common-words'
import { dictionaryPronunciations } from '../../../server/utils/prosody/dictionary'
import { findRhymes } from '../../../server/utils/prosody/finder'

const parts = (w: string) => dictionaryPronunciations(w)!.map(p => rhymePart(p).join(' '))

describe('rhyme finder', () => {
  it('lists perfect rhymes that share the rhyme part, grouped by syllables, common words first', () => {
    const r = findRhymes('day', { limit: 200 })
    expect(r.perfect.length).toBeGreaterThan(100)
    // CMU Pronouncing Dictionary: each candidate has a pronunciation ending in stressed EY
    for (const c of r.perfect) expect(parts(c.word), c.word).toContain('EY')
    const levels = r.perfect.map(c => commonnessLevel(c.word)!)
    expect([...levels].sort((a, b) => a - b)).toEqual(levels)
    expect(r.groups.perfect.map(g => g.syllables)).toEqual([...r.groups.perfect.map(g => g.syllables)].sort((a, b) => a - b))
    expect(r.groups.perfect.flatMap(g => g.words).length).toBe(r.perfect.length)
  })

  it('leaves out identical rhymes and the query itself', () => {
    const r = findRhymes('sight', { limit: 200 })
    const words = r.perfect.map(c => c.word)
    expect(words).toContain('night')
    expect(words).not.toContain('site')
    expect(words).not.toContain('sight')
  })

  it('finds none for orange, and near and multi candidates instead', () => {
    // CMU Pronouncing Dictionary: orange has no perfect rhyme (DOMAIN.md §3)
    const r = findRhymes('orange')
    expect(r.perfect).toEqual([])
    expect(r.near.length + r.multi.length).toBeGreaterThan(0)
    for (const c of r.multi) expect(c.matched).toBeGreaterThanOrEqual(2)
  })

  it('rhymes a short phrase as said, function words unstressed', () => {
    const r = findRhymes('know it', { limit: 200 })
    expect(r.phones).toEqual(['N', 'OW1', 'AH0', 'T'])
    expect(r.perfect.map(c => c.word)).toContain('poet')
  })

  it('offers the crew\'s own words, marked as theirs', () => {
    const lexicon = new Map([['skrrt', [['S', 'K', 'ER1', 'T']]], ['glizz', [['G', 'L', 'IH1', 'Z']]]])
    const r = findRhymes('hurt', { lexicon })
    expect(r.perfect[0]).toEqual({ word: 'skrrt', syllables: 1, lexicon: true })
    expect(findRhymes('skrrt', { lexicon }).source).toBe('lexicon')
  })
})
