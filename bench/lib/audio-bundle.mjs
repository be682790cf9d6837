// Bundles the server's pure audio modules (TypeScript) into one ESM file the benchmark can
// import, with esbuild (already installed with Vite). Packages stay external.
import { build } from 'esbuild'
import { mkdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { root } from '../../scripts/lib/paths.mjs'

export async function audioModules() {
  const outDir = resolve(root, 'bench/out/.cache')
  mkdirSync(outDir, { recursive: true })
  const outfile = resolve(outDir, 'audio.mjs')
  await build({
    stdin: {
      contents: `export * from './server/utils/audio/analyse'
export * from './server/utils/audio/decode'
export * from './server/utils/audio/synth'
export * from './server/utils/audio/wav'
export * from './server/utils/audio/onsets'
export * from './server/utils/audio/tempo'
export * from './server/utils/audio/beats'`,
      resolveDir: root,
      loader: 'ts',
    },
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    outfile,
    logLevel: 'error',
  })
  return outfile
}
