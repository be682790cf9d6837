import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { permissionMarkdown } from '../../shared/utils/permissions'

const readme = readFileSync('README.md', 'utf8')

describe('README', () => {
  it('prints the permission table exactly as the server enforces it', () => {
    const start = readme.indexOf('<!-- permissions:start -->')
    const end = readme.indexOf('<!-- permissions:end -->')
    expect(start, 'README needs the permissions markers').toBeGreaterThan(-1)
    const printed = readme.slice(start + '<!-- permissions:start -->'.length, end).trim()
    expect(printed, `Paste this table into README.md:\n${permissionMarkdown()}\n`).toBe(permissionMarkdown())
  })

  it('has a Quickstart of exactly the two commands', () => {
    const quick = readme.slice(readme.indexOf('## Quickstart'), readme.indexOf('\n## ', readme.indexOf('## Quickstart') + 5))
    const commands = [...quick.matchAll(/^```(?:sh|bash)?\n([\s\S]*?)```/gm)].flatMap(m => m[1]!.trim().split('\n'))
    expect(commands).toEqual(['npm start', 'npm test'])
  })
})
