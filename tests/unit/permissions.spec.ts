import { describe, expect, it } from 'vitest'
import { can, PERMISSIONS, ROLES } from '../../shared/utils/permissions'

describe('permission table', () => {
  it('lets the owner do everything', () => {
    for (const action of Object.keys(PERMISSIONS) as Array<keyof typeof PERMISSIONS>) expect(can('owner', action)).toBe(true)
  })

  it('keeps the listener read-only', () => {
    const allowed = (Object.keys(PERMISSIONS) as Array<keyof typeof PERMISSIONS>).filter(a => can('listener', a))
    expect(allowed.every(a => a.endsWith('.view') || a.endsWith('.list'))).toBe(true)
  })

  it('lists only known roles', () => {
    for (const roles of Object.values(PERMISSIONS)) for (const r of roles) expect(ROLES).toContain(r)
  })

  it('refuses a missing role', () => {
    expect(can(null, 'crew.view')).toBe(false)
    expect(can(undefined, 'song.view')).toBe(false)
  })

  it('matches the crew roles of the design: only owners manage members', () => {
    for (const r of ROLES) expect(can(r, 'member.invite')).toBe(r === 'owner')
    expect(ROLES.filter(r => can(r, 'song.create'))).toEqual(['owner', 'producer', 'writer'])
  })
})
