/**
 * Reviewed rap-usage corrections, applied before the CMU Pronouncing Dictionary. Each entry
 * replaces (never adds to) the dictionary's pronunciations of that spelling and says why.
 * Keep it small: a crew's own words belong in its lexicon, not here.
 */
export interface Correction {
  /** Pronunciations in ARPAbet, the first one preferred. */
  prons: string[]
  reason: string
}

export const CORRECTIONS: Record<string, Correction> = {
  'mic': { prons: ['M AY1 K'], reason: 'Short for microphone ("mike"); the dictionary has only "mick".' },
  'mics': { prons: ['M AY1 K S'], reason: 'Plural of mic as a microphone; missing from the dictionary.' },
  'mic\'d': { prons: ['M AY1 K T'], reason: 'Past tense of mic (to put a microphone on).' },
  'bae': { prons: ['B EY1'], reason: 'Slang for babe/partner, said "bay"; the dictionary has only "bye".' },
  'tryna': { prons: ['T R AY1 N AH0'], reason: 'Contraction of "trying to", two syllables; missing from the dictionary.' },
  'finna': { prons: ['F IH1 N AH0'], reason: 'Contraction of "fixing to", two syllables; missing from the dictionary.' },
  'gon': { prons: ['G AA1 N', 'G OW1 N'], reason: 'Short "going to" ("gon\' do it"); the dictionary entry is a surname.' },
  'gon\'': { prons: ['G AA1 N', 'G OW1 N'], reason: 'Same as gon, written with the dropped-letter apostrophe.' },
  'yall': { prons: ['Y AO1 L'], reason: 'y\'all typed without its apostrophe; the dictionary lacks this spelling.' },
  'shawty': { prons: ['SH AO1 T IY0'], reason: 'Slang for a young woman ("shorty"); missing from the dictionary.' },
  'homie': { prons: ['HH OW1 M IY0'], reason: 'Slang for a close friend; missing from the dictionary.' },
  'homies': { prons: ['HH OW1 M IY0 Z'], reason: 'Plural of homie.' },
  'bruh': { prons: ['B R AH1'], reason: 'Slang for brother, one syllable; missing from the dictionary.' },
  'skrrt': { prons: ['S K ER1 T'], reason: 'Tyre-screech ad-lib, said like "skirt"; missing from the dictionary.' },
  'opps': { prons: ['AA1 P S'], reason: 'Plural of opp (opponents); missing from the dictionary.' },
  'ad-lib': { prons: ['AE1 D L IH1 B'], reason: 'Trade word; the hyphenated spelling is missing from the dictionary.' },
  'adlib': { prons: ['AE1 D L IH1 B'], reason: 'Trade word, written closed up.' },
  'adlibs': { prons: ['AE1 D L IH1 B Z'], reason: 'Plural of adlib.' },
}
