import { analyseDraft } from '../utils/prosody/analyse'
import { finderIndex } from '../utils/prosody/finder'

/**
 * Builds the rhyme finder's index and warms the analysis (word lists, letter-to-sound rules,
 * compiled code) right after start-up instead of on a writer's first request. It runs on a
 * timer so the server is listening first; a request arriving meanwhile waits at most that once.
 */
export default defineNitroPlugin(() => {
  const timer = setTimeout(() => {
    const started = performance.now()
    finderIndex()
    analyseDraft({
      lines: [
        { id: 'w1', bar: 1, text: 'Warming up the engine (yeah) on the 808, runnin\' since \'96' },
        { id: 'w2', bar: 2, text: 'stagelight glowing, every zorbly line in rhyme' },
      ],
      sections: [{ id: 'w', startBar: 1, endBar: 2 }],
    })
    console.info(`[prosody] finder index and analysis warmed in ${Math.round(performance.now() - started)} ms`)
  }, 50)
  timer.unref()
})
