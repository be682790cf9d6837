// Rhyme kinds against the handbooks, worked pairs; multi rhymes on worked phrases; the
// end-rhyme scheme; rhyme density as Malmi et al. (KDD 2016) define it.
import { describe, expect, it } from 'vitest'
import { analyseDraft } from '../../../server/utils/prosody/analyse'
import { rhymeDensity } from '../../../server/utils/prosody/density'
import { dictionaryPronunciations } from '../../../server/utils/prosody/dictionary'
import { isSlant, rhymeKind } from '../../../server/utils/prosody/rhyme'

const p = (w: string) => dictionaryPronunciations(w)![0]!
const kind = (a: string, b: string) => rhymeKind(p(a), p(b))
const draft = (...texts: string[]) => analyseDraft({ lines: texts.map((text, i) => ({ id: `l${i + 1}`, bar: i + 1, text })) })

describe('rhyme kinds', () => {
  it('perfect: identical stressed vowel and what follows, different onset', () => {
    // Brogan & Cushman, Princeton Encyclopedia of Poetry and Poetics, 4th ed. (2012), "rhyme"
    for (const [a, b] of [['cat', 'hat'], ['night', 'light'], ['flow', 'go'], ['money', 'funny'], ['battery', 'flattery'], ['street', 'beat']]) {
      expect(kind(a, b), `${a}/${b}`).toBe('perfect')
    }
    // Same onset too is identical rhyme, not counted as rhyme (Princeton Encyclopedia)
    expect(kind('sight', 'site')).toBe('identical')
  })

  it('assonance: the same stressed vowels with different end consonants', () => {
    // Encyclopaedia Britannica, "assonance"
    expect(kind('lake', 'fame')).toBe('assonance')
    expect(kind('time', 'light')).toBe('assonance')
    expect(isSlant(kind('lake', 'fame'))).toBe(true)
  })

  it('consonance and slant rhyme: consonants the same, vowels different, or the reverse', () => {
    // Encyclopaedia Britannica, "consonance"; slant rhyme per Princeton Encyclopedia (young/song)
    expect(kind('young', 'song')).toBe('consonance')
    expect(isSlant(kind('young', 'song'))).toBe(true)
    expect(kind('love', 'move')).toBe('consonance') // eye rhyme: spelling alike, sounds only share V
  })

  it('near: same vowels, consonants of the same manner, or one added at the end', () => {
    // common practice: additive rhyme fire/tired, soul/cold; manner classes per Zwicky (1976, from memory)
    expect(kind('soul', 'cold')).toBe('near')
    expect(kind('tight', 'ride')).toBe('near')
    expect(kind('cat', 'hat')).not.toBe('near')
    expect(kind('dog', 'bus')).toBe('none')
  })
})

describe('families, scheme and multis in a draft', () => {
  it('letters the end-rhyme scheme in order of first appearance', () => {
    // common practice (DOMAIN.md §3)
    expect(draft('I feel the beat', 'down on the street', 'we let it flow', 'and then we go').scheme).toEqual(['A', 'A', 'B', 'B'])
    expect(draft('I feel the beat', 'we let it flow', 'down on the street', 'and then we go').scheme).toEqual(['A', 'B', 'A', 'B'])
    expect(draft('another day', 'another night', 'we came to stay', 'we went away').scheme).toEqual(['A', 'B', 'A', 'A'])
  })

  it('gives families with kind and each word by line and index', () => {
    const a = draft('I feel the beat', 'down on the street')
    const fam = a.families.find(f => f.words.some(w => w.text === 'beat'))!
    expect(fam).toMatchObject({ kind: 'perfect', key: 'IY T', letter: 'A', endRhyme: true })
    expect(fam.words).toEqual([{ lineId: 'l1', index: 3, text: 'beat' }, { lineId: 'l2', index: 3, text: 'street' }])
    expect(a.lines[0]!.words[3]!.family).toBe(fam.id)
  })

  it('marks internal rhymes inside a line', () => {
    const a = draft('the night is tight and the light is right')
    const fam = a.families.find(f => f.key === 'AY T')!
    expect(fam.internal).toBe(true)
    expect(fam.words.map(w => w.text)).toEqual(['night', 'tight', 'light', 'right'])
  })

  it('does not count the same word again as a rhyme', () => {
    expect(draft('all night', 'all night').families.filter(f => f.kind !== 'multi')).toEqual([])
  })

  it('finds multis across word boundaries: a phrase against a word', () => {
    // mosaic rhyme, Hirjee & Brown (ISMIR 2009): "poet / know it"; worked phrases of our own
    const a = draft('they call me a poet', 'and you know it')
    const multi = a.families.find(f => f.kind === 'multi')!
    expect(multi).toMatchObject({ key: 'OW AH', syllables: 2 })
    expect(multi.words.map(w => w.text)).toEqual(['poet', 'know', 'it'])
    expect(a.scheme).toEqual(['A', 'A'])

    const b = draft('sipping on lemonade', 'running from the renegade')
    const m3 = b.families.find(f => f.kind === 'multi')!
    expect(m3.syllables).toBeGreaterThanOrEqual(3)
    expect(m3.words.map(w => w.text)).toEqual(expect.arrayContaining(['lemonade', 'renegade']))

    const c = draft('the night bus rolls slow', 'the bright lights below')
    expect(c.families.some(f => f.kind === 'multi')).toBe(true)
  })
})

describe('rhyme density (Malmi et al., DopeLearning, KDD 2016)', () => {
  it('is the mean longest vowel match with the 15 words before, as defined', () => {
    // Worked values (DOMAIN.md §3): lemonade/renegade match 3 vowels, money/funny 2
    expect(rhymeDensity([{ phones: p('lemonade') }, { phones: p('renegade') }])).toBe(3)
    expect(rhymeDensity([{ phones: p('money') }, { phones: p('funny') }])).toBe(2)
    // A run of one vowel counts 0; the same word again counts 0
    expect(rhymeDensity([{ phones: p('cat') }, { phones: p('hat') }])).toBe(0)
    expect(rhymeDensity([{ phones: p('money') }, { phones: p('money') }])).toBe(0)
    expect(rhymeDensity([{ phones: p('money') }])).toBeNull()
    // Beyond 15 words back no match is looked for
    const filler = Array.from({ length: 15 }, () => ({ phones: p('dog') }))
    expect(rhymeDensity([{ phones: p('money') }, ...filler, { phones: p('funny') }])).toBe(0)
  })

  it('is given per section, from the section\'s own lines, repeated lines once', () => {
    const a = analyseDraft({
      lines: [
        { id: 'a', bar: 1, text: 'money' }, { id: 'b', bar: 2, text: 'funny' },
        { id: 'c', bar: 3, text: 'dog' }, { id: 'd', bar: 4, text: 'dog' }, { id: 'e', bar: 4, text: 'cat' },
      ],
      sections: [{ id: 'verse', startBar: 1, endBar: 2, kind: 'verse' }, { id: 'hook', startBar: 3, endBar: 4, kind: 'hook' }],
    })
    expect(a.sections!.map(s => [s.id, s.rhymeDensity, s.lineIds])).toEqual([['verse', 2, ['a', 'b']], ['hook', 0, ['c', 'd', 'e']]])
  })
})

describe('bars against the grid', () => {
  it('gives syllables per beat and per second, and flags over-packed bars', () => {
    // 4/4: syllables per second = syllables × BPM / 240 (DOMAIN.md §4, arithmetic)
    const text = Array.from({ length: 16 }, () => 'money').join(' ') // 32 syllables
    const a = analyseDraft({ lines: [{ id: 'a', bar: 1, text }, { id: 'b', bar: 2, text: 'night bus home' }], grid: { bpm: 90, beatsPerBar: 4 } })
    expect(a.bars[0]).toMatchObject({ bar: 1, syllables: 32, syllablesPerBeat: 8, syllablesPerSecond: 12, overPacked: true, dense: true })
    expect(a.bars[1]).toMatchObject({ bar: 2, syllables: 3, syllablesPerSecond: 1.13, overPacked: false, dense: false })
    // Half-time: one lyric bar spans two project bars
    const h = analyseDraft({ lines: [{ id: 'a', bar: 1, text }], grid: { bpm: 90, beatsPerBar: 4, feel: 'half' } })
    expect(h.bars[0]!.syllablesPerSecond).toBe(6)
  })
})
