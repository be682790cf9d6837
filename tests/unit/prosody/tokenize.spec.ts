// The tokeniser on lyrics as writers type them (cases from the issue); numerals read the way
// the trade says them (common practice).
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { spokenNumber } from '../../../server/utils/prosody/numbers'
import { tokenize } from '../../../server/utils/prosody/tokenize'
import { analyseDraft } from '../../../server/utils/prosody/analyse'

const words = (line: string) => tokenize(line).map(t => t.text)
const said = (line: string) => tokenize(line).map(t => t.spoken.join(' '))

describe('tokeniser', () => {
  it('keeps contractions and dropped letters whole', () => {
    expect(words('\'cause y\'all runnin\' runnin tryna see \'em')).toEqual(['\'cause', 'y\'all', 'runnin\'', 'runnin', 'tryna', 'see', '\'em'])
    // CMU Pronouncing Dictionary holds 'cause, 'em and y'all with the apostrophe
    const line = analyseDraft({ lines: [{ id: 'a', bar: 1, text: '\u2018cause y\u2019all see \u2018em' }] }).lines[0]!
    expect(line.words.map(w => [w.normalized, w.source])).toEqual([['\'cause', 'dictionary'], ['y\'all', 'dictionary'], ['see', 'dictionary'], ['\'em', 'dictionary']])
  })

  it('strips quote marks that are not apostrophes', () => {
    expect(words('she said \'go\' and "run"')).toEqual(['she', 'said', 'go', 'and', 'run'])
  })

  it('reads numbers and numerals as words', () => {
    expect(said('808 24/7 \'96 1999 100')).toEqual(['eight oh eight', 'twenty four seven', 'ninety six', 'nineteen ninety nine', 'one hundred'])
    expect(spokenNumber('2005')).toEqual(['two', 'thousand', 'five'])
    expect(spokenNumber('2020')).toEqual(['twenty', 'twenty'])
    expect(spokenNumber('1,000')).toEqual(['one', 'thousand'])
    expect(spokenNumber('3rd')).toEqual(['third'])
    expect(spokenNumber('90s')).toEqual(['nineties'])
    expect(spokenNumber('360')).toEqual(['three', 'sixty'])
    const a = analyseDraft({ lines: [{ id: 'n', bar: 1, text: 'my 808 since 1999' }] }).lines[0]!
    // eight-oh-eight = 3 syllables, nineteen ninety-nine = 5 (CMU Pronouncing Dictionary counts of each word)
    expect(a.words.map(w => w.syllables)).toEqual([1, 3, 1, 5])
    expect(a.words[1]).toMatchObject({ text: '808', spoken: ['eight', 'oh', 'eight'], source: 'dictionary', method: 'number' })
  })

  it('splits hyphenated and slashed words unless the dictionary has the whole form', () => {
    expect(words('double-time him/her')).toEqual(['double', 'time', 'him', 'her'])
    // CMU Pronouncing Dictionary has "x-ray" as one headword
    expect(words('x-ray eyes')).toEqual(['x-ray', 'eyes'])
    const t = tokenize('double-time')
    expect(t.map(x => [x.start, x.end])).toEqual([[0, 6], [7, 11]])
  })

  it('marks ad-libs in parentheses and counts them apart', () => {
    const t = tokenize('I keep it moving (yeah, uh) all night (skrrt')
    expect(t.filter(x => x.isAdlib).map(x => x.text)).toEqual(['yeah', 'uh', 'skrrt'])
    const line = analyseDraft({ lines: [{ id: 'a', bar: 1, text: 'keep it moving (yeah yeah)' }] }).lines[0]!
    expect([line.syllables, line.adlibSyllables]).toEqual([4, 2])
    expect(line.words.filter(w => w.isAdlib).map(w => w.index)).toEqual([3, 4])
  })

  it('ignores punctuation and emoji, and keeps offsets true to the line', () => {
    const line = 'Lights on!!! 🔥🔥 — we\u2019re “live”… ¿qué? naïve'
    const t = tokenize(line)
    expect(t.map(x => x.text)).toEqual(['Lights', 'on', 'we\u2019re', 'live', 'qué', 'naïve'])
    for (const x of t) expect(line.slice(x.start, x.end)).toBe(x.text)
    expect(t.find(x => x.text === 'naïve')!.norm).toBe('naive')
  })

  it('is safe on any Unicode input: never throws, offsets always slice the text', () => {
    fc.assert(fc.property(fc.string({ unit: 'grapheme', maxLength: 200 }), (s) => {
      const t = tokenize(s)
      for (const x of t) expect(s.slice(x.start, x.end)).toBe(x.text)
      analyseDraft({ lines: [{ id: 'p', bar: 1, text: s }] })
    }), { numRuns: 300 })
  })
})
