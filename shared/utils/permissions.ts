/**
 * The one permission table: every action a route performs, and the crew roles allowed to do
 * it. The server enforces it through `requireCrewAccess` and friends; the client reads it
 * only to hide buttons a role may not use.
 */
export const ROLES = ['owner', 'producer', 'writer', 'cowriter', 'listener'] as const
export type Role = typeof ROLES[number]

export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  producer: 'Producer',
  writer: 'Writer',
  cowriter: 'Co-writer',
  listener: 'Listener',
}

const everyone: readonly Role[] = ROLES

export const PERMISSIONS = {
  // crew
  'crew.view': everyone,
  'crew.rename': ['owner'],
  'member.list': everyone,
  'member.invite': ['owner'],
  'member.setRole': ['owner'],
  'member.remove': ['owner'],
  // songs
  'song.view': everyone,
  'song.create': ['owner', 'producer', 'writer'],
  'song.rename': ['owner', 'producer', 'writer'],
  'song.delete': ['owner'],
  // drafts and versions (reading them is song.view)
  'draft.create': ['owner', 'writer'],
  'draft.edit': ['owner', 'writer'],
  'version.save': ['owner', 'writer'],
  // alts: proposing never touches the draft itself; taking or passing one is a writer's call
  'alt.propose': ['owner', 'writer', 'cowriter'],
  'alt.vote': ['owner', 'producer', 'writer', 'cowriter'],
  'alt.comment': ['owner', 'producer', 'writer', 'cowriter'],
  'alt.decide': ['owner', 'writer'],
  // finishing: lines out, sign-off, seal, split sheet (reading them is song.view)
  'line.markOut': ['owner', 'producer', 'writer'],
  'signoff.request': ['owner', 'writer'],
  'signoff.signers': ['owner'],
  'signoff.sign': ['owner', 'producer', 'writer', 'cowriter'],
  'seal.unseal': ['owner'],
  'split.edit': ['owner', 'writer'],
  'split.confirm': ['owner', 'producer', 'writer', 'cowriter'],
  // prosody: the crew's lexicon (pronunciations the analysis and the rhyme finder use)
  'lexicon.view': everyone,
  'lexicon.edit': ['owner', 'writer', 'cowriter'],
  // beats, grid and sections (viewing and playing them is 'song.view')
  'beat.upload': ['owner', 'producer'],
  'grid.edit': ['owner', 'producer'],
  'section.edit': ['owner', 'producer'],
  // scratch takes: recording, renaming and deleting one's own (listening is 'song.view')
  'scratch.record': ['owner', 'producer', 'writer', 'cowriter'],
} as const satisfies Record<string, readonly Role[]>

export type Action = keyof typeof PERMISSIONS

export function can(role: Role | null | undefined, action: Action): boolean {
  return !!role && (PERMISSIONS[action] as readonly Role[]).includes(role)
}

/** The table as Markdown, as the README prints it (a unit test keeps the two equal). */
export function permissionMarkdown(): string {
  const rows = (Object.keys(PERMISSIONS) as Action[]).map(action =>
    `| \`${action}\` | ${ROLES.map(r => (can(r, action) ? '✓' : '·')).join(' | ')} |`)
  return [`| action | ${ROLES.map(r => ROLE_LABELS[r].toLowerCase()).join(' | ')} |`, `|---|${ROLES.map(() => ':-:').join('|')}|`, ...rows].join('\n')
}
