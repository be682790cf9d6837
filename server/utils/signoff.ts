import { randomUUID } from 'node:crypto'
import { and, asc, desc, eq, inArray, ne } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { can, ROLE_LABELS, type Action, type Role } from '../../shared/utils/permissions'
import { isPerformed } from '../../shared/utils/sheet'
import {
  crews, drafts, memberships, sealLifts, seals, signoffRequests, signoffSigners, songs, users, versions,
  type Seal, type SignoffRequest, type Song,
} from '../database/schema'
import type { MailInput } from './mail'
import type { DbOrTx } from './db'

/** The crew's members with names, e-mail and role. */
export async function crewRoster(db: DbOrTx, crewId: string) {
  return db.select({ userId: users.id, name: users.name, email: users.email, role: memberships.role })
    .from(memberships).innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.crewId, crewId)).orderBy(asc(users.name))
}

/** Who signs when the owner has not chosen: every writer plus the producer(s); the owners if the crew has neither. */
export function defaultSignerIds(roster: ReadonlyArray<{ userId: string, role: Role }>): string[] {
  const chosen = roster.filter(m => m.role === 'writer' || m.role === 'producer')
  return (chosen.length ? chosen : roster.filter(m => m.role === 'owner')).map(m => m.userId)
}

const signoffPage = (songId: string) => `${useEnv().APP_URL}/songs/${songId}/signoff`

function signoffMail(to: string, subject: string, intro: string, songId: string, outro = 'You get this because you are a member of the crew.'): MailInput {
  return linkMail(to, subject, intro, 'Open the sign-off', signoffPage(songId), outro)
}

/** One sign-off request with its version, requester and signers, as the API returns it. */
export async function loadSignoffView(db: DbOrTx, requestId: string) {
  const [row] = await db.select({
    request: signoffRequests, versionNumber: versions.number, draftName: drafts.name, requesterName: users.name,
  }).from(signoffRequests)
    .innerJoin(versions, eq(versions.id, signoffRequests.versionId))
    .innerJoin(drafts, eq(drafts.id, signoffRequests.draftId))
    .leftJoin(users, eq(users.id, signoffRequests.requestedBy))
    .where(eq(signoffRequests.id, requestId))
  if (!row) return null
  const signers = await db.select({
    userId: signoffSigners.userId, name: users.name, role: memberships.role,
    decision: signoffSigners.decision, comment: signoffSigners.comment, decidedAt: signoffSigners.decidedAt,
  }).from(signoffSigners)
    .innerJoin(users, eq(users.id, signoffSigners.userId))
    .innerJoin(signoffRequests, eq(signoffRequests.id, signoffSigners.requestId))
    .innerJoin(songs, eq(songs.id, signoffRequests.songId))
    .leftJoin(memberships, and(eq(memberships.userId, signoffSigners.userId), eq(memberships.crewId, songs.crewId)))
    .where(eq(signoffSigners.requestId, requestId))
    .orderBy(asc(users.name))
  const r = row.request
  return {
    id: r.id,
    songId: r.songId,
    draftId: r.draftId,
    draftName: row.draftName,
    versionId: r.versionId,
    versionNumber: row.versionNumber,
    status: r.status,
    note: r.note,
    requestedBy: r.requestedBy ? { id: r.requestedBy, name: row.requesterName } : null,
    createdAt: r.createdAt,
    closedAt: r.closedAt,
    closedReason: r.closedReason,
    signers,
  }
}

export type SignoffView = NonNullable<Awaited<ReturnType<typeof loadSignoffView>>>

/** Every sign-off request of a song, newest first. */
export async function listSignoffViews(db: DbOrTx, songId: string): Promise<SignoffView[]> {
  const ids = await db.select({ id: signoffRequests.id }).from(signoffRequests)
    .where(eq(signoffRequests.songId, songId)).orderBy(desc(signoffRequests.createdAt))
  const views = await Promise.all(ids.map(r => loadSignoffView(db, r.id)))
  return views.filter((v): v is SignoffView => !!v)
}

/** Loads the sign-off request behind the `signoffId` route parameter and checks `action` in its crew. */
export function requireSignoffAccess(event: H3Event, action: Action, param = 'signoffId') {
  return requireRowAccess(event, action, param, 'Sign-off', async (id) => {
    const [row] = await useDb().select({ request: signoffRequests, song: songs }).from(signoffRequests)
      .innerJoin(songs, eq(songs.id, signoffRequests.songId))
      .where(eq(signoffRequests.id, id))
    return row
  })
}

/** Loads the seal behind the `sealId` route parameter and checks `action` in its crew. */
export function requireSealAccess(event: H3Event, action: Action, param = 'sealId') {
  return requireRowAccess(event, action, param, 'Seal', async (id) => {
    const [row] = await useDb().select({ seal: seals, song: songs }).from(seals)
      .innerJoin(songs, eq(songs.id, seals.songId))
      .where(eq(seals.id, id))
    return row
  })
}

function assertSignable(roster: Awaited<ReturnType<typeof crewRoster>>, userIds: readonly string[]) {
  const byId = new Map(roster.map(m => [m.userId, m]))
  userIds.forEach((id, i) => {
    const m = byId.get(id)
    if (!m) throw createError({ statusCode: 400, message: `Signer ${i + 1} is not a member of this crew.`, data: { fields: { [`userIds.${i}`]: 'not a member' } } })
    if (!can(m.role, 'signoff.sign')) {
      throw createError({ statusCode: 400, message: `${m.name} is a ${ROLE_LABELS[m.role].toLowerCase()} in this crew and cannot sign off.`, data: { fields: { [`userIds.${i}`]: 'cannot sign' } } })
    }
  })
}

/**
 * Opens a sign-off on `versionId`, which must be its draft's newest version, on a song with no
 * sealed sheet and no other open sign-off on that draft. Signers default to every writer and
 * producer; each is told by e-mail.
 */
export async function openSignoff(db: DbOrTx, input: { song: Song, versionId: string, requester: { id: string, name: string }, note?: string }) {
  return db.transaction(async (tx) => {
    const [row] = await tx.select({ version: versions, draft: drafts }).from(versions)
      .innerJoin(drafts, eq(drafts.id, versions.draftId)).where(eq(versions.id, input.versionId))
    const { version, draft } = row!
    const [locked] = await tx.select({ headVersionId: drafts.headVersionId, archivedAt: drafts.archivedAt }).from(drafts).where(eq(drafts.id, draft.id)).for('update')
    if (locked!.archivedAt) throw createError({ statusCode: 409, message: 'This draft is archived. Restore it before asking for sign-off.' })
    if (locked!.headVersionId !== version.id) {
      throw createError({ statusCode: 409, message: `Sign-off is asked on a draft's newest version; version ${version.number} is not the newest of "${draft.name}". Restore it first if it is the one.` })
    }
    if (!version.lines.some(isPerformed)) throw createError({ statusCode: 409, message: 'This version has no performed lines (every line is empty or marked out): there is nothing to sign off.' })
    const sealed = await activeSealOfSong(tx, input.song.id)
    if (sealed) throw createError({ statusCode: 409, message: `This song already has a sealed final sheet (version ${sealed.versionNumber} of "${sealed.draftName}"). The owner can unseal it first.` })
    const [open] = await tx.select({ id: signoffRequests.id }).from(signoffRequests)
      .where(and(eq(signoffRequests.draftId, draft.id), eq(signoffRequests.status, 'open')))
    if (open) throw createError({ statusCode: 409, message: 'This draft already has an open sign-off. Withdraw it, or wait for its signers.', data: { signoffId: open.id } })

    const roster = await crewRoster(tx, input.song.crewId)
    const signerIds = defaultSignerIds(roster)
    const [request] = await tx.insert(signoffRequests).values({
      songId: input.song.id, draftId: draft.id, versionId: version.id, requestedBy: input.requester.id, note: input.note || null,
    }).returning()
    await tx.insert(signoffSigners).values(signerIds.map(userId => ({ requestId: request!.id, userId })))
    const byId = new Map(roster.map(m => [m.userId, m]))
    await queueMail(tx, signerIds.map(id => signoffMail(byId.get(id)!.email,
      `Sign-off asked: "${input.song.title}", version ${version.number}`,
      `${input.requester.name} asks the crew to sign off version ${version.number} of "${input.song.title}" (draft "${draft.name}") as the final sheet. You are one of the signers: read it, then approve or decline with a comment.${input.note ? `\n\nTheir note: ${input.note}` : ''}`,
      input.song.id)))
    await publishSongEvent(tx, input.song.id, { type: 'signoff', signoffId: request!.id, status: 'open' })
    return request!
  })
}

async function lockOpen(tx: DbOrTx, requestId: string) {
  const [request] = await tx.select().from(signoffRequests).where(eq(signoffRequests.id, requestId)).for('update')
  if (!request) throw notFound('Sign-off')
  if (request.status !== 'open') throw createError({ statusCode: 409, message: `This sign-off is closed (${request.status}${request.closedReason ? `: ${request.closedReason}` : ''}). Ask for a new one.` })
  return request
}

async function signerMails(tx: DbOrTx, requestId: string, extra: string[] = []) {
  const rows = await tx.select({ userId: users.id, email: users.email }).from(signoffSigners)
    .innerJoin(users, eq(users.id, signoffSigners.userId)).where(eq(signoffSigners.requestId, requestId))
  const more = extra.length ? await tx.select({ userId: users.id, email: users.email }).from(users).where(inArray(users.id, extra)) : []
  return [...new Map([...rows, ...more].map(r => [r.userId, r.email])).values()]
}

async function closeSignoff(tx: DbOrTx, request: SignoffRequest, status: 'declined' | 'withdrawn' | 'cancelled', reason: string, by: string | null) {
  await tx.update(signoffRequests).set({ status, closedReason: reason, closedAt: new Date(), closedBy: by }).where(eq(signoffRequests.id, request.id))
  await publishSongEvent(tx, request.songId, { type: 'signoff', signoffId: request.id, status })
}

/** The owner's choice of signers for an open sign-off; decisions of signers kept on stay. May seal. */
export async function setSignoffSigners(db: DbOrTx, input: { request: SignoffRequest, song: Song, userIds: string[], by: { id: string, name: string } }) {
  return db.transaction(async (tx) => {
    const request = await lockOpen(tx, input.request.id)
    const roster = await crewRoster(tx, input.song.crewId)
    assertSignable(roster, input.userIds)
    const before = await tx.select({ userId: signoffSigners.userId }).from(signoffSigners).where(eq(signoffSigners.requestId, request.id))
    const had = new Set(before.map(b => b.userId))
    const removed = before.map(b => b.userId).filter(id => !input.userIds.includes(id))
    if (removed.length) await tx.delete(signoffSigners).where(and(eq(signoffSigners.requestId, request.id), inArray(signoffSigners.userId, removed)))
    const added = input.userIds.filter(id => !had.has(id))
    if (added.length) await tx.insert(signoffSigners).values(added.map(userId => ({ requestId: request.id, userId })))
    const [version] = await tx.select({ number: versions.number }).from(versions).where(eq(versions.id, request.versionId))
    const byId = new Map(roster.map(m => [m.userId, m]))
    await queueMail(tx, added.map(id => signoffMail(byId.get(id)!.email,
      `Sign-off asked: "${input.song.title}", version ${version!.number}`,
      `${input.by.name} added you as a signer of version ${version!.number} of "${input.song.title}". Read it, then approve or decline with a comment.`,
      input.song.id)))
    await publishSongEvent(tx, input.song.id, { type: 'signoff', signoffId: request.id, status: 'open' })
    await sealIfAllApproved(tx, request, input.song)
  })
}

/**
 * A listed signer's decision. A decline closes the sign-off (every signer must approve);
 * the last approval seals the version, which needs a split sheet totalling 100.00 % with
 * every listed member's confirmation (else 409 and nothing is recorded).
 */
export async function decideSignoff(db: DbOrTx, input: { request: SignoffRequest, song: Song, user: { id: string, name: string }, decision: 'approve' | 'decline', comment: string }) {
  return db.transaction(async (tx) => {
    const request = await lockOpen(tx, input.request.id)
    const [updated] = await tx.update(signoffSigners).set({ decision: input.decision, comment: input.comment || null, decidedAt: new Date() })
      .where(and(eq(signoffSigners.requestId, request.id), eq(signoffSigners.userId, input.user.id))).returning({ id: signoffSigners.id })
    if (!updated) throw createError({ statusCode: 403, message: 'You are not a signer of this sign-off. The owner decides who signs.' })
    if (input.decision === 'decline') {
      await closeSignoff(tx, request, 'declined', `Declined by ${input.user.name}: ${input.comment}`, input.user.id)
      const [version] = await tx.select({ number: versions.number }).from(versions).where(eq(versions.id, request.versionId))
      const emails = await signerMails(tx, request.id, request.requestedBy ? [request.requestedBy] : [])
      await queueMail(tx, emails.map(to => signoffMail(to,
        `Sign-off declined: "${input.song.title}", version ${version!.number}`,
        `${input.user.name} declined version ${version!.number} of "${input.song.title}":\n\n"${input.comment}"\n\nThe sign-off is closed. Save a new version that answers it, then ask again.`,
        input.song.id)))
      return { sealed: false }
    }
    await publishSongEvent(tx, input.song.id, { type: 'signoff', signoffId: request.id, status: 'open' })
    return { sealed: await sealIfAllApproved(tx, request, input.song) }
  })
}

/** The requester or an owner takes an open sign-off back. */
export async function withdrawSignoff(db: DbOrTx, input: { request: SignoffRequest, song: Song, user: { id: string, name: string }, role: Role }) {
  if (input.request.requestedBy !== input.user.id && input.role !== 'owner') {
    throw createError({ statusCode: 403, message: 'Only whoever asked for this sign-off, or an owner, can withdraw it.' })
  }
  return db.transaction(async (tx) => {
    const request = await lockOpen(tx, input.request.id)
    await closeSignoff(tx, request, 'withdrawn', `Withdrawn by ${input.user.name}`, input.user.id)
  })
}

/**
 * Called for every new version: an open sign-off on an older version of the same draft is
 * cancelled, and its signers are told (mail and a song event).
 */
export async function cancelSignoffsOnNewVersion(tx: DbOrTx, input: { songId: string, draftId: string, version: { id: string, number: number } }) {
  const open = await tx.select({ request: signoffRequests, number: versions.number, title: songs.title }).from(signoffRequests)
    .innerJoin(versions, eq(versions.id, signoffRequests.versionId))
    .innerJoin(songs, eq(songs.id, signoffRequests.songId))
    .where(and(eq(signoffRequests.draftId, input.draftId), eq(signoffRequests.status, 'open'), ne(signoffRequests.versionId, input.version.id)))
  for (const { request, number, title } of open) {
    const reason = `Version ${input.version.number} was saved, so version ${number} is no longer the newest.`
    await closeSignoff(tx, request, 'cancelled', reason, null)
    const emails = await signerMails(tx, request.id, request.requestedBy ? [request.requestedBy] : [])
    await queueMail(tx, emails.map(to => signoffMail(to,
      `Sign-off cancelled: "${title}", version ${number}`,
      `The sign-off on version ${number} of "${title}" was cancelled: ${reason} Nothing is sealed; a writer can ask again on the new version.`,
      request.songId)))
  }
}

async function sealIfAllApproved(tx: DbOrTx, request: SignoffRequest, song: Song): Promise<boolean> {
  const signers = await tx.select({
    userId: signoffSigners.userId, decision: signoffSigners.decision, comment: signoffSigners.comment, decidedAt: signoffSigners.decidedAt,
    name: users.name, role: memberships.role,
  }).from(signoffSigners)
    .innerJoin(users, eq(users.id, signoffSigners.userId))
    .leftJoin(memberships, and(eq(memberships.userId, signoffSigners.userId), eq(memberships.crewId, song.crewId)))
    .where(eq(signoffSigners.requestId, request.id))
  if (!signers.length || signers.some(s => s.decision !== 'approve')) return false

  const split = await loadSplitLines(tx, song.id)
  const problem = splitReadiness(split)
  if (problem) throw createError({ statusCode: 409, message: `Every signer approved, but the sheet cannot be sealed yet. ${problem} Nothing was recorded; approve again once it is fixed.` })

  const sealId = randomUUID()
  const pdfKey = `sheets/${song.id}/${sealId}.pdf`
  await tx.insert(seals).values({
    id: sealId,
    songId: song.id,
    versionId: request.versionId,
    requestId: request.id,
    pdfKey,
    signers: signers.map(s => ({ userId: s.userId, name: s.name, role: s.role ?? 'former member', comment: s.comment, decidedAt: s.decidedAt!.toISOString() })),
    split: splitSnapshot(split),
  })
  await tx.update(signoffRequests).set({ status: 'sealed', closedAt: new Date(), closedReason: 'Every signer approved' }).where(eq(signoffRequests.id, request.id))
  await mailSealedSheet(tx, song, request.versionId, pdfKey)
  await publishSongEvent(tx, song.id, { type: 'seal', sealId, versionId: request.versionId })
  return true
}

/** Renders the sealed sheet's PDF into storage and queues it to every member of the crew. */
export async function mailSealedSheet(tx: DbOrTx, song: Song, versionId: string, pdfKey: string) {
  const model = await loadSheetModel(tx, versionId)
  const pdf = await renderSheetPdf(model!)
  await useStorage('files').setItemRaw(pdfKey, pdf)
  const roster = await crewRoster(tx, song.crewId)
  const [crew] = await tx.select({ name: crews.name }).from(crews).where(eq(crews.id, song.crewId))
  const filename = sheetFileName(model!, 'pdf')
  await queueMail(tx, roster.map(m => ({
    ...linkMail(m.email, `Sealed: "${song.title}", version ${model!.version.number}`,
      `Every signer approved version ${model!.version.number} of "${song.title}". It is sealed as ${crew!.name}'s final sheet; the PDF is attached.`,
      'Open the final sheet', `${useEnv().APP_URL}/songs/${song.id}/sheet`,
      'Nobody can change a sealed sheet. Only an owner can unseal it, with a reason everyone can read.'),
    attachments: [{ filename, contentType: 'application/pdf', storageKey: pdfKey }],
  })))
}

/**
 * The owner's unsealing: records the reason (the seal stays as history, marked lifted by
 * the record) and starts a new main draft from the sealed version, which stays as it was.
 */
export async function liftSeal(db: DbOrTx, input: { seal: Seal, song: Song, user: { id: string, name: string }, reason: string }) {
  return db.transaction(async (tx) => {
    const [locked] = await tx.select({ id: seals.id }).from(seals).where(eq(seals.id, input.seal.id)).for('share')
    const [lifted] = await tx.select({ id: sealLifts.id }).from(sealLifts).where(eq(sealLifts.sealId, locked!.id))
    if (lifted) throw createError({ statusCode: 409, message: 'This seal was already lifted.' })
    const [row] = await tx.select({ version: versions, draft: drafts }).from(versions)
      .innerJoin(drafts, eq(drafts.id, versions.draftId)).where(eq(versions.id, input.seal.versionId))
    const { version, draft } = row!
    await tx.update(drafts).set({ isMain: false }).where(eq(drafts.songId, input.song.id))
    const [created] = await tx.insert(drafts).values({ songId: input.song.id, name: `${draft.name} (reopened)`.slice(0, 80), createdBy: input.user.id, isMain: true }).returning()
    const saved = await saveVersion(tx, {
      draft: created!, authorId: input.user.id, baseVersionId: null, lines: version.lines, doc: version.doc,
      note: `Reopened from sealed version ${version.number} of "${draft.name}": ${input.reason}`.slice(0, 500), kind: 'copy',
    })
    const [lift] = await tx.insert(sealLifts).values({
      sealId: input.seal.id, liftedBy: input.user.id, liftedByName: input.user.name, reason: input.reason, newDraftId: created!.id,
    }).returning()
    const roster = await crewRoster(tx, input.song.crewId)
    await queueMail(tx, roster.map(m => linkMail(m.email, `Unsealed: "${input.song.title}", version ${version.number}`,
      `${input.user.name} unsealed version ${version.number} of "${input.song.title}".\n\nReason: ${input.reason}\n\nThe sealed version stays as it was; work goes on in the new draft "${created!.name}".`,
      'Open the song\'s activity', `${useEnv().APP_URL}/songs/${input.song.id}/activity`, 'You get this because you are a member of the crew.')))
    await publishSongEvent(tx, input.song.id, { type: 'unseal', sealId: input.seal.id, draftId: created!.id })
    return { liftId: lift!.id, draftId: created!.id, versionId: saved.saved ? saved.version.id : null }
  })
}
