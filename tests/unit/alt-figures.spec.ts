import { describe, expect, it } from 'vitest'
import { altFigures } from '../../server/utils/alt-figures'

// Syllable counts and rhymes below come from the CMU Pronouncing Dictionary through the
// prosody engine: code K OW1 D, road R OW1 D, showed SH OW1 D (perfect rhymes: same stressed
// vowel and coda, different onsets), street S T R IY1 T (no rhyme with them).
const head = [
  { id: 'a', bar: 1, text: 'Lamps on the avenue blinking in code' },
  { id: 'b', bar: 2, text: 'I read each window along the road' },
  { id: 'c', bar: 3, text: 'Pocket full of lint and a borrowed coat' },
]
const alt = (id: string, lineId: string, text: string) => ({ id, lineId, text, status: 'open' as const })

describe('alt figures (prosody engine)', () => {
  it('counts an alt\'s syllables and tells whether it keeps the line\'s rhyme family', () => {
    const figures = altFigures(head, [
      alt('keeps', 'b', 'I read each window the neon showed'),
      alt('leaves', 'b', 'I read each window along the street'),
    ])
    // I(1) read(1) each(1) window(2) the(1) neon(2) showed(1) = 9 — CMU Pronouncing Dictionary
    expect(figures.keeps).toMatchObject({ syllables: 9, keepsFamily: true })
    // I read each window along(2) the street = 9, and street leaves the code/road family.
    expect(figures.leaves).toMatchObject({ syllables: 9, keepsFamily: false })
    // The line itself: I read each window along the road = 9.
    expect(figures['line:b']).toMatchObject({ syllables: 9, family: expect.any(String) })
    expect(figures.keeps!.family).toBe(figures['line:b']!.family)
  })

  it('has no family to keep when the line rhymes with nothing, and skips decided alts', () => {
    const lines = [{ id: 'x', bar: 1, text: 'Nothing here rhymes with orange' }, { id: 'y', bar: 2, text: 'The bus is late again tonight' }]
    const figures = altFigures(lines, [alt('n', 'x', 'Nothing here rhymes with the fruit'), { ...alt('d', 'y', 'decided'), status: 'passed' as const }])
    expect(figures.n).toMatchObject({ keepsFamily: null })
    expect(figures.d).toBeUndefined()
  })

  it('an alt for a line no longer in the head still gets its syllables', () => {
    const figures = altFigures(head, [alt('gone', 'zzz', 'Night bus home')])
    // night(1) bus(1) home(1) — CMU Pronouncing Dictionary
    expect(figures.gone).toEqual({ syllables: 3, keepsFamily: null })
  })
})
