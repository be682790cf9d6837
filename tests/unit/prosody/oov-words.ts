/**
 * Words the CMU Pronouncing Dictionary lacks, as writers type them, with their syllable counts
 * as said in rap (from memory: counted aloud by the author, not from a reference).
 */
export const OOV_WORDS: Array<[word: string, syllables: number]> = [
  // slang
  ['hella', 2], ['drippin', 2], ['flexin', 2], ['finessin', 3], ['deadass', 2], ['bussin', 2], ['vibin', 2],
  ['lituation', 4], ['yeet', 1], ['swaggin', 2], ['trappin', 2], ['bando', 2], ['boujee', 2], ['jawn', 1],
  ['simp', 1], ['simpin', 2], ['zaddy', 2], ['glizzy', 2], ['shmoney', 2], ['rizz', 1], ['periodt', 3],
  ['lowkey', 2], ['highkey', 2], ['blingin', 2], ['flyest', 2], ['illest', 2], ['dopest', 2], ['cheugy', 2],
  ['stanning', 2], ['wokeness', 2], ['skrrtin', 2],
  // compounds
  ['stagelight', 2], ['streetlight', 2], ['nightbus', 2], ['mixtape', 2], ['beatmaker', 3], ['hookline', 2],
  ['flowmaster', 3], ['crewmate', 2], ['soundcheck', 2], ['cloutchaser', 3], ['ganglife', 2], ['moonwalkin', 3],
  ['backstagers', 3], ['lamplit', 2], ['nightcrawlin', 3],
  // dropped g and other dropped letters
  ['runnin', 2], ['chillin', 2], ['spittin', 2], ['rhymin', 2], ['grindin', 2], ['hustlin', 2], ['boomin', 2],
  ['poppin', 2], ['somethin', 2], ['freestylin', 3], ['ballin\'', 2], ['stuntin', 2], ['cruisin', 2],
  ['everythin', 3], ['tryin', 2],
]
