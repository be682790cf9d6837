// Rebuilds server/utils/prosody/lts-model.json, the letter-to-sound guesser's rules, from the
// CMU Pronouncing Dictionary installed in node_modules (every headword of letters a–z, its first
// pronunciation). Run after upgrading cmu-pronouncing-dictionary: node scripts/build-lts-model.mjs
import { writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { createJiti } from 'jiti'
import { root } from './lib/paths.mjs'

const jiti = createJiti(import.meta.url)
const { train } = await jiti.import(resolve(root, 'server/utils/prosody/lts.ts'))
const { trainingEntries } = await jiti.import(resolve(root, 'server/utils/prosody/lts-data.ts'))
const started = performance.now()
const model = train(trainingEntries())
const sorted = Object.fromEntries(Object.entries(model.rules).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)))
const out = resolve(root, 'server/utils/prosody/lts-model.json')
writeFileSync(out, `${JSON.stringify({ windows: model.windows, meta: model.meta, rules: sorted })}\n`)
console.log(`lts-model.json: ${model.meta.rules} rules from ${model.meta.trainedOn} words (${model.meta.skipped} not alignable) in ${Math.round(performance.now() - started)} ms`)
