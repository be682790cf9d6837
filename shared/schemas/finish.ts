import { z } from 'zod'
import { LinesSchema } from './drafts'
import { shareToBp } from '../utils/shares'

export const OutMarksSchema = z.object({
  baseVersionId: z.uuid({ error: 'baseVersionId must be the id of the draft\'s newest version.' }),
  lines: LinesSchema,
  note: z.string().trim().max(500, 'A note holds at most 500 characters.').optional(),
})

export const SignoffRequestSchema = z.object({
  note: z.string().trim().max(500, 'A note holds at most 500 characters.').optional(),
})

export const SignersSchema = z.object({
  userIds: z.array(z.uuid({ error: 'Each signer is a member id.' }), { error: 'Send the signers as a list of member ids.' })
    .min(1, 'Choose at least one signer.')
    .max(50, 'At most 50 signers.')
    .refine(ids => new Set(ids).size === ids.length, 'A signer is listed twice.'),
})

export const DecisionSchema = z.object({
  decision: z.enum(['approve', 'decline'], { error: 'Decide approve or decline.' }),
  comment: z.string({ error: 'The comment is text.' }).trim().max(1000, 'A comment holds at most 1000 characters.').default(''),
}).refine(d => d.decision !== 'decline' || d.comment.length > 0, { path: ['comment'], message: 'Say what should change when you decline.' })

export const UnsealSchema = z.object({
  reason: z.string({ error: 'Give the reason for unsealing.' }).trim()
    .min(5, 'Give the reason for unsealing (at least 5 characters): it is kept in the song\'s activity.')
    .max(1000, 'A reason holds at most 1000 characters.'),
})

const shareField = z.union([z.string(), z.number()], { error: 'A share is a per cent, like 33.33.' })
  .transform((v, ctx) => {
    const bp = shareToBp(v)
    if (bp === null || bp === 0) {
      ctx.addIssue({ code: 'custom', message: 'A share is a per cent above 0 and at most 100, with up to two decimals (33.33).' })
      return z.NEVER
    }
    return bp
  })

export const SplitLineSchema = z.object({
  /** A crew member; leave out for a named outside contributor. */
  userId: z.uuid({ error: 'That member id is not valid.' }).nullish(),
  name: z.string({ error: 'Name each writer.' }).trim().min(1, 'Name each writer.').max(120, 'A name holds at most 120 characters.'),
  role: z.string().trim().max(60, 'A role holds at most 60 characters.').nullish(),
  share: shareField,
})

export const SplitSchema = z.object({
  lines: z.array(SplitLineSchema, { error: 'Send the split sheet as a list of lines.' })
    .min(1, 'List at least one writer.')
    .max(40, 'A split sheet holds at most 40 writers.')
    .superRefine((lines, ctx) => {
      const seen = new Set<string>()
      lines.forEach((l, i) => {
        if (!l.userId) return
        if (seen.has(l.userId)) ctx.addIssue({ code: 'custom', path: [i, 'userId'], message: 'This member is listed twice.' })
        seen.add(l.userId)
      })
    }),
})

export const SplitConfirmSchema = z.object({
  confirm: z.boolean({ error: 'Send confirm: true to confirm your line, false to take it back.' }).default(true),
})
