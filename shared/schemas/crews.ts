import { z } from 'zod'
import { ROLES } from '../utils/permissions'
import { emailField } from './auth'

export const crewNameField = z.string({ error: 'Name the crew.' })
  .trim()
  .min(1, 'Name the crew.')
  .max(80, 'Use at most 80 characters.')

export const roleField = z.enum(ROLES, { error: `Pick a role: ${ROLES.join(', ')}.` })

export const CrewSchema = z.object({ name: crewNameField })

export const InviteSchema = z.object({
  email: emailField,
  role: roleField,
})

export const RoleChangeSchema = z.object({ role: roleField })

export const uuidParam = (label: string) => z.uuid({ error: `That ${label} id is not valid.` })
