import { randomUUID } from 'node:crypto'
import type { Action, Role } from '../../shared/utils/permissions'
import type { ApiClient } from '../support/http'
import { StreamProbe } from '../support/sse'
import type { Principal, TestCrew } from '../support/people'
import type { Method } from '../support/routes'
import { smallWav, audioForm, uploadBeat, waitForBeat } from '../support/beats'
import { can as canDo } from '../../shared/utils/permissions'
import { draftWithLines, requestSignoff, sealedSong } from '../support/finish'

export interface MatrixContext {
  crew: TestCrew
  song: () => Promise<string>
  member: (role?: string) => Promise<string>
  invite: (email?: string) => Promise<string>
  inviteToken: (email: string) => Promise<string>
  crewWithSpareOwner: () => Promise<TestCrew>
  /** A new draft on a new song, with one saved version. */
  draft: () => Promise<{ songId: string, draftId: string, versionId: string }>
  /** A save by `p` refused as stale (kept aside); by the writer when `p` may not save. */
  sideSave: (p: Principal) => Promise<string>
  freshClient: (p: Principal) => Promise<ApiClient>
  /** A new draft (one version, line m1) with an open alt on m1 by the owner. */
  alt: () => Promise<{ songId: string, draftId: string, versionId: string, altId: string }>
  /** A save by `p` (else the writer) kept aside, and the head it was refused against. */
  keptAside: (p: Principal) => Promise<{ sideSaveId: string, headVersionId: string }>
  lexiconEntry: () => Promise<string>
}

export interface MatrixCase {
  method: Method
  route: string
  /** 'public': no session needed; 'user': any signed-in account; else the crew action checked. */
  access: 'public' | 'user' | Action
  /** Status for a principal that is allowed. */
  ok: number
  /** Route parameters and body for one call by `principal`; may make fresh rows or a fresh client. */
  prepare?: (ctx: MatrixContext, principal: Principal) => Promise<{ params?: Record<string, string>, query?: Record<string, string>, body?: unknown, client?: ApiClient }>
}

const allowed = (p: Principal, action: Action) => p !== 'anonymous' && p !== 'outsider' && canDo(p, action)
const freshSignoff = async (ctx: MatrixContext, asker: 'writer' | 'owner' = 'writer') => requestSignoff(ctx.crew.as[asker], (await draftWithLines(ctx.crew)).versionId)

/** Rows made once per run and shared by the routes that only read them. */
const shared = (() => {
  let signoff: Promise<{ songId: string, signoffId: string }> | undefined
  let seal: ReturnType<typeof sealedSong> | undefined
  return {
    signoff: (ctx: MatrixContext) => (signoff ??= draftWithLines(ctx.crew).then(async d => ({ songId: d.songId, signoffId: await requestSignoff(ctx.crew.as.writer, d.versionId) }))),
    seal: (ctx: MatrixContext) => (seal ??= sealedSong(ctx.crew)),
  }
})()

const email = () => `m-${randomUUID().slice(0, 8)}@example.test`
const fakeToken = () => randomUUID().replace(/-/g, '').repeat(2)
// One analysed beat, made once and shared by the read-only beat routes.
let readyBeat: Promise<{ songId: string, beatId: string }> | undefined
const sharedBeat = (ctx: MatrixContext) => (readyBeat ??= (async () => {
  const songId = await ctx.song()
  const res = await uploadBeat(ctx.crew.as.owner, songId, smallWav())
  await waitForBeat(ctx.crew.as.owner, songId, res.body.id)
  return { songId, beatId: res.body.id as string }
})())
const songWithSections = async (ctx: MatrixContext, count: number) => {
  const songId = await ctx.song()
  const ids: string[] = []
  for (let i = 0; i < count; i++) {
    const res = await ctx.crew.as.owner.post(`/api/songs/${songId}/sections`, { kind: 'verse', startBar: 1 + i * 8, endBar: 8 + i * 8 })
    ids.push(res.body.id)
  }
  return { songId, ids }
}

const emailOf = (ctx: MatrixContext, p: Principal) => (p === 'anonymous' ? email() : ctx.crew.users[p].email)

// A scratch take on a new song, recorded by `by` (the writer when `by` may not record).
const takeBy = async (ctx: MatrixContext, by: Principal) => {
  const songId = await ctx.song()
  const who: Role = allowed(by, 'scratch.record') ? by as Role : 'writer'
  const res = await ctx.crew.as[who].post(`/api/songs/${songId}/takes?bar=3&durationMs=1000`, audioForm(smallWav({ bars: 1 }), 'take.wav'))
  return { songId, takeId: res.body.id as string }
}
let sharedTake: ReturnType<typeof takeBy> | undefined

export const MATRIX: MatrixCase[] = [
  // accounts
  { method: 'POST', route: '/api/auth/register', access: 'public', ok: 201, prepare: async () => ({ body: { name: 'Matrix', email: email(), password: 'long-enough-pass' } }) },
  { method: 'POST', route: '/api/auth/login', access: 'public', ok: 200, prepare: async ctx => ({ body: { email: ctx.crew.users.listener.email, password: 'barsmith-demo' }, client: await ctx.freshClient('anonymous') }) },
  { method: 'POST', route: '/api/auth/logout', access: 'public', ok: 204, prepare: async (ctx, p) => ({ client: await ctx.freshClient(p) }) },
  { method: 'POST', route: '/api/auth/verify', access: 'public', ok: 400, prepare: async () => ({ body: { token: fakeToken() } }) },
  { method: 'POST', route: '/api/auth/resend', access: 'public', ok: 200, prepare: async () => ({ body: { email: email() } }) },
  { method: 'POST', route: '/api/auth/forgot', access: 'public', ok: 200, prepare: async () => ({ body: { email: email() } }) },
  { method: 'POST', route: '/api/auth/reset', access: 'public', ok: 400, prepare: async () => ({ body: { token: fakeToken(), password: 'long-enough-pass' } }) },
  { method: 'GET', route: '/api/health', access: 'public', ok: 200 },
  { method: 'GET', route: '/api/me', access: 'user', ok: 200 },

  // crews and members
  { method: 'GET', route: '/api/crews', access: 'user', ok: 200 },
  { method: 'POST', route: '/api/crews', access: 'user', ok: 201, prepare: async () => ({ body: { name: 'A new crew' } }) },
  { method: 'GET', route: '/api/crews/[crewId]', access: 'crew.view', ok: 200 },
  { method: 'PATCH', route: '/api/crews/[crewId]', access: 'crew.rename', ok: 200, prepare: async () => ({ body: { name: 'Renamed crew' } }) },
  {
    method: 'POST', route: '/api/crews/[crewId]/leave', access: 'crew.view', ok: 204,
    prepare: async (ctx, p) => {
      const other = await ctx.crewWithSpareOwner()
      return { params: { crewId: other.crewId }, client: p === 'anonymous' ? other.as.anonymous : p === 'outsider' ? ctx.crew.as.outsider : other.as[p] }
    },
  },
  { method: 'GET', route: '/api/crews/[crewId]/members', access: 'member.list', ok: 200 },
  { method: 'PATCH', route: '/api/crews/[crewId]/members/[userId]', access: 'member.setRole', ok: 200, prepare: async ctx => ({ params: { userId: await ctx.member() }, body: { role: 'listener' } }) },
  { method: 'DELETE', route: '/api/crews/[crewId]/members/[userId]', access: 'member.remove', ok: 204, prepare: async ctx => ({ params: { userId: await ctx.member() } }) },
  { method: 'GET', route: '/api/crews/[crewId]/invites', access: 'member.invite', ok: 200 },
  { method: 'POST', route: '/api/crews/[crewId]/invites', access: 'member.invite', ok: 201, prepare: async () => ({ body: { email: email(), role: 'writer' } }) },
  { method: 'DELETE', route: '/api/crews/[crewId]/invites/[inviteId]', access: 'member.invite', ok: 204, prepare: async ctx => ({ params: { inviteId: await ctx.invite() } }) },
  { method: 'GET', route: '/api/invites/[token]', access: 'public', ok: 200, prepare: async ctx => ({ params: { token: await ctx.inviteToken(email()) } }) },
  { method: 'POST', route: '/api/invites/[token]/accept', access: 'user', ok: 200, prepare: async (ctx, p) => ({ params: { token: await ctx.inviteToken(emailOf(ctx, p)) } }) },

  // songs
  { method: 'GET', route: '/api/crews/[crewId]/songs', access: 'song.view', ok: 200 },
  { method: 'POST', route: '/api/crews/[crewId]/songs', access: 'song.create', ok: 201, prepare: async () => ({ body: { title: 'Matrix song' } }) },
  { method: 'GET', route: '/api/songs/[songId]', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: await ctx.song() } }) },
  { method: 'PATCH', route: '/api/songs/[songId]', access: 'song.rename', ok: 200, prepare: async ctx => ({ params: { songId: await ctx.song() }, body: { title: 'Renamed' } }) },
  { method: 'DELETE', route: '/api/songs/[songId]', access: 'song.delete', ok: 204, prepare: async ctx => ({ params: { songId: await ctx.song() } }) },

  // drafts and versions
  { method: 'GET', route: '/api/songs/[songId]/drafts', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: (await ctx.draft()).songId } }) },
  { method: 'POST', route: '/api/songs/[songId]/drafts', access: 'draft.create', ok: 201, prepare: async ctx => ({ params: { songId: await ctx.song() }, body: { name: 'Matrix draft' } }) },
  { method: 'GET', route: '/api/drafts/[draftId]', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { draftId: (await ctx.draft()).draftId } }) },
  { method: 'PATCH', route: '/api/drafts/[draftId]', access: 'draft.edit', ok: 200, prepare: async ctx => ({ params: { draftId: (await ctx.draft()).draftId }, body: { name: 'Renamed draft' } }) },
  { method: 'GET', route: '/api/drafts/[draftId]/versions', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { draftId: (await ctx.draft()).draftId } }) },
  {
    method: 'POST', route: '/api/drafts/[draftId]/versions', access: 'version.save', ok: 201,
    prepare: async (ctx) => {
      const d = await ctx.draft()
      return { params: { draftId: d.draftId }, body: { baseVersionId: d.versionId, lines: [{ id: 'm1', bar: 1, text: 'matrix line' }] } }
    },
  },
  { method: 'GET', route: '/api/drafts/[draftId]/side-saves', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { draftId: (await ctx.draft()).draftId } }) },
  { method: 'GET', route: '/api/versions/[versionId]', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { versionId: (await ctx.draft()).versionId } }) },
  { method: 'POST', route: '/api/versions/[versionId]/restore', access: 'version.save', ok: 201, prepare: async ctx => ({ params: { versionId: (await ctx.draft()).versionId } }) },
  { method: 'PATCH', route: '/api/side-saves/[sideSaveId]', access: 'version.save', ok: 200, prepare: async (ctx, p) => ({ params: { sideSaveId: await ctx.sideSave(p) }, body: {} }) },

  // history, merges, alts, live, notifications
  { method: 'GET', route: '/api/versions/[versionId]/diff', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { versionId: (await ctx.draft()).versionId } }) },
  {
    method: 'POST', route: '/api/side-saves/[sideSaveId]/merge', access: 'version.save', ok: 201,
    prepare: async (ctx, p) => {
      const kept = await ctx.keptAside(p)
      return { params: { sideSaveId: kept.sideSaveId }, body: { baseVersionId: kept.headVersionId, lines: [{ id: 'm1', bar: 1, text: 'merged' }] } }
    },
  },
  { method: 'GET', route: '/api/drafts/[draftId]/alts', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { draftId: (await ctx.alt()).draftId } }) },
  { method: 'POST', route: '/api/drafts/[draftId]/alts', access: 'alt.propose', ok: 201, prepare: async ctx => ({ params: { draftId: (await ctx.draft()).draftId }, body: { lineId: 'm1', text: 'a matrix alt' } }) },
  { method: 'GET', route: '/api/alts/[altId]', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { altId: (await ctx.alt()).altId } }) },
  { method: 'PUT', route: '/api/alts/[altId]/vote', access: 'alt.vote', ok: 200, prepare: async ctx => ({ params: { altId: (await ctx.alt()).altId }, body: { value: 1 } }) },
  { method: 'GET', route: '/api/alts/[altId]/comments', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { altId: (await ctx.alt()).altId } }) },
  { method: 'POST', route: '/api/alts/[altId]/comments', access: 'alt.comment', ok: 201, prepare: async ctx => ({ params: { altId: (await ctx.alt()).altId }, body: { body: 'a matrix comment' } }) },
  { method: 'POST', route: '/api/alts/[altId]/take', access: 'alt.decide', ok: 201, prepare: async ctx => ({ params: { altId: (await ctx.alt()).altId } }) },
  { method: 'POST', route: '/api/alts/[altId]/pass', access: 'alt.decide', ok: 200, prepare: async ctx => ({ params: { altId: (await ctx.alt()).altId } }) },
  { method: 'GET', route: '/api/songs/[songId]/events', access: 'song.view', ok: 200, prepare: async (ctx, p) => ({ params: { songId: await ctx.song() }, client: new StreamProbe(ctx.crew.as[p]) }) },
  { method: 'GET', route: '/api/songs/[songId]/presence', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: await ctx.song() } }) },
  { method: 'GET', route: '/api/notifications', access: 'user', ok: 200 },
  { method: 'POST', route: '/api/notifications/read', access: 'user', ok: 200, prepare: async () => ({ body: { all: true } }) },
  // finishing: lines out, sign-off, seals, sheet exports, split sheet, activity. Rows that a
  // principal only reads, or is refused, are made once; each allowed change gets fresh ones
  // (every sign-off and seal sends mail, so the matrix keeps their number down).
  {
    method: 'POST', route: '/api/drafts/[draftId]/out-marks', access: 'line.markOut', ok: 201,
    prepare: async (ctx) => {
      const d = await ctx.draft()
      return { params: { draftId: d.draftId }, body: { baseVersionId: d.versionId, lines: [{ id: 'm1', bar: 1, text: 'v1', out: true }] } }
    },
  },
  { method: 'GET', route: '/api/songs/[songId]/signoffs', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: (await shared.signoff(ctx)).songId } }) },
  { method: 'POST', route: '/api/versions/[versionId]/signoffs', access: 'signoff.request', ok: 201, prepare: async ctx => ({ params: { versionId: (await draftWithLines(ctx.crew)).versionId }, body: {} }) },
  { method: 'GET', route: '/api/signoffs/[signoffId]', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { signoffId: (await shared.signoff(ctx)).signoffId } }) },
  {
    method: 'PUT', route: '/api/signoffs/[signoffId]/signers', access: 'signoff.signers', ok: 200,
    prepare: async (ctx, p) => ({ params: { signoffId: allowed(p, 'signoff.signers') ? await freshSignoff(ctx) : (await shared.signoff(ctx)).signoffId }, body: { userIds: [ctx.crew.users.writer.id, ctx.crew.users.cowriter.id] } }),
  },
  {
    method: 'POST', route: '/api/signoffs/[signoffId]/decision', access: 'signoff.sign', ok: 200,
    prepare: async (ctx, p) => {
      if (!allowed(p, 'signoff.sign')) return { params: { signoffId: (await shared.signoff(ctx)).signoffId }, body: { decision: 'approve', comment: '' } }
      // The principal is listed beside a second signer, so one approval does not seal.
      const signoffId = await freshSignoff(ctx)
      const signers = [...new Set([ctx.crew.users[p as Role].id, p === 'producer' ? ctx.crew.users.writer.id : ctx.crew.users.producer.id])]
      await ctx.crew.as.owner.put(`/api/signoffs/${signoffId}/signers`, { userIds: signers })
      return { params: { signoffId }, body: { decision: 'approve', comment: '' } }
    },
  },
  {
    method: 'POST', route: '/api/signoffs/[signoffId]/withdraw', access: 'signoff.request', ok: 200,
    prepare: async (ctx, p) => ({ params: { signoffId: allowed(p, 'signoff.request') ? await freshSignoff(ctx, p === 'owner' ? 'owner' : 'writer') : (await shared.signoff(ctx)).signoffId } }),
  },
  {
    method: 'POST', route: '/api/seals/[sealId]/unseal', access: 'seal.unseal', ok: 201,
    prepare: async (ctx, p) => ({ params: { sealId: allowed(p, 'seal.unseal') ? (await sealedSong(ctx.crew)).sealId : (await shared.seal(ctx)).sealId }, body: { reason: 'A late fix to the hook' } }),
  },
  { method: 'GET', route: '/api/songs/[songId]/seal', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: (await shared.seal(ctx)).songId } }) },
  { method: 'GET', route: '/api/versions/[versionId]/sheet', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { versionId: (await shared.seal(ctx)).versionId } }) },
  { method: 'GET', route: '/api/versions/[versionId]/sheet.txt', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { versionId: (await shared.seal(ctx)).versionId } }) },
  { method: 'GET', route: '/api/versions/[versionId]/sheet.vtt', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { versionId: (await shared.seal(ctx)).versionId } }) },
  { method: 'GET', route: '/api/versions/[versionId]/sheet.pdf', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { versionId: (await shared.seal(ctx)).versionId } }) },
  { method: 'GET', route: '/api/songs/[songId]/split', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: (await shared.seal(ctx)).songId } }) },
  { method: 'PUT', route: '/api/songs/[songId]/split', access: 'split.edit', ok: 200, prepare: async ctx => ({ params: { songId: await ctx.song() }, body: { lines: [{ name: 'Outside Contributor', share: '100.00' }] } }) },
  {
    method: 'POST', route: '/api/songs/[songId]/split/confirm', access: 'split.confirm', ok: 200,
    prepare: async (ctx, p) => {
      const songId = await ctx.song()
      const listed = allowed(p, 'split.confirm') ? ctx.crew.users[p as Role].id : ctx.crew.users.writer.id
      await ctx.crew.as.owner.put(`/api/songs/${songId}/split`, { lines: [{ userId: listed, name: 'Listed member', share: 100 }] })
      return { params: { songId }, body: { confirm: true } }
    },
  },
  { method: 'GET', route: '/api/songs/[songId]/activity', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: (await shared.seal(ctx)).songId } }) },
  // scratch takes
  { method: 'GET', route: '/api/songs/[songId]/takes', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: (await (sharedTake ??= takeBy(ctx, 'writer'))).songId } }) },
  { method: 'POST', route: '/api/songs/[songId]/takes', access: 'scratch.record', ok: 201, prepare: async ctx => ({ params: { songId: await ctx.song() }, query: { bar: '5', durationMs: '1000' }, body: audioForm(smallWav({ bars: 1 }), 'take.wav') }) },
  { method: 'PATCH', route: '/api/songs/[songId]/takes/[takeId]', access: 'scratch.record', ok: 200, prepare: async (ctx, p) => ({ params: await takeBy(ctx, p), body: { name: 'Renamed take' } }) },
  { method: 'DELETE', route: '/api/songs/[songId]/takes/[takeId]', access: 'scratch.record', ok: 204, prepare: async (ctx, p) => ({ params: await takeBy(ctx, p) }) },
  { method: 'GET', route: '/api/songs/[songId]/takes/[takeId]/audio', access: 'song.view', ok: 200, prepare: async ctx => ({ params: await (sharedTake ??= takeBy(ctx, 'writer')) }) },
  // vocal map
  { method: 'GET', route: '/api/songs/[songId]/vocal-map', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: (await ctx.draft()).songId } }) },
  // prosody: analysis, rhyme finder, crew lexicon
  { method: 'POST', route: '/api/analysis', access: 'user', ok: 200, prepare: async () => ({ body: { lines: [{ id: 'a', bar: 1, text: 'night bus home' }] } }) },
  { method: 'GET', route: '/api/rhymes', access: 'user', ok: 200, prepare: async () => ({ query: { q: 'night' } }) },
  { method: 'GET', route: '/api/crews/[crewId]/lexicon', access: 'lexicon.view', ok: 200 },
  { method: 'POST', route: '/api/crews/[crewId]/lexicon', access: 'lexicon.edit', ok: 201, prepare: async () => ({ body: { word: `zq${randomUUID().replace(/[^a-f]/g, '').slice(0, 8)}`, phones: 'Z IY1 K Y UW0' } }) },
  { method: 'PATCH', route: '/api/crews/[crewId]/lexicon/[entryId]', access: 'lexicon.edit', ok: 200, prepare: async ctx => ({ params: { entryId: await ctx.lexiconEntry() }, body: { soundsLike: 'skirt' } }) },
  { method: 'DELETE', route: '/api/crews/[crewId]/lexicon/[entryId]', access: 'lexicon.edit', ok: 204, prepare: async ctx => ({ params: { entryId: await ctx.lexiconEntry() } }) },
  // beats, grid and sections
  { method: 'POST', route: '/api/songs/[songId]/beats', access: 'beat.upload', ok: 201, prepare: async ctx => ({ params: { songId: await ctx.song() }, body: audioForm(smallWav({ bars: 2 }), 'matrix.wav') }) },
  { method: 'GET', route: '/api/songs/[songId]/beats', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: (await sharedBeat(ctx)).songId } }) },
  { method: 'GET', route: '/api/songs/[songId]/beats/[beatId]', access: 'song.view', ok: 200, prepare: async ctx => ({ params: await sharedBeat(ctx) }) },
  { method: 'GET', route: '/api/songs/[songId]/beats/[beatId]/audio', access: 'song.view', ok: 200, prepare: async ctx => ({ params: await sharedBeat(ctx) }) },
  { method: 'GET', route: '/api/songs/[songId]/beats/[beatId]/peaks', access: 'song.view', ok: 200, prepare: async ctx => ({ params: await sharedBeat(ctx) }) },
  { method: 'PATCH', route: '/api/songs/[songId]/grid', access: 'grid.edit', ok: 200, prepare: async ctx => ({ params: { songId: await ctx.song() }, body: { bpm: 92.5, offsetMs: 120 } }) },
  { method: 'GET', route: '/api/songs/[songId]/sections', access: 'song.view', ok: 200, prepare: async ctx => ({ params: { songId: (await songWithSections(ctx, 1)).songId } }) },
  { method: 'POST', route: '/api/songs/[songId]/sections', access: 'section.edit', ok: 201, prepare: async ctx => ({ params: { songId: await ctx.song() }, body: { kind: 'hook', startBar: 9, endBar: 16 } }) },
  {
    method: 'PATCH', route: '/api/songs/[songId]/sections/[sectionId]', access: 'section.edit', ok: 200,
    prepare: async (ctx) => {
      const { songId, ids } = await songWithSections(ctx, 1)
      return { params: { songId, sectionId: ids[0]! }, body: { label: 'Verse 1', endBar: 16 } }
    },
  },
  {
    method: 'DELETE', route: '/api/songs/[songId]/sections/[sectionId]', access: 'section.edit', ok: 204,
    prepare: async (ctx) => {
      const { songId, ids } = await songWithSections(ctx, 1)
      return { params: { songId, sectionId: ids[0]! } }
    },
  },
  {
    method: 'PUT', route: '/api/songs/[songId]/sections/order', access: 'section.edit', ok: 200,
    prepare: async (ctx) => {
      const { songId, ids } = await songWithSections(ctx, 2)
      return { params: { songId }, body: { ids: [...ids].reverse() } }
    },
  },
]
