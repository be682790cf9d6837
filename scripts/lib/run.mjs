import { spawn, spawnSync } from 'node:child_process'

/** Runs a command to completion, streaming its output; rejects on a non-zero exit. */
export function run(cmd, args, options = {}) {
  return new Promise((resolvePromise, reject) => {
    const child = spawn(cmd, args, { stdio: options.quiet ? ['ignore', 'pipe', 'pipe'] : 'inherit', ...options })
    let output = ''
    const collect = (d) => {
      output += d
    }
    child.stdout?.on('data', collect)
    child.stderr?.on('data', collect)
    child.on('error', reject)
    child.on('exit', (code, signal) => {
      if (code === 0) resolvePromise(output)
      else reject(new Error(`${cmd} ${args.join(' ')} exited with ${code ?? signal}\n${output.slice(-4000)}`))
    })
  })
}

export function commandExists(cmd) {
  return spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0
}
