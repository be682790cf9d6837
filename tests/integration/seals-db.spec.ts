// The database itself keeps a sealed sheet: raw SQL, bypassing the server, cannot change or
// delete a sealed version, its seal or the split sheet kept in the seal.
import { beforeAll, describe, expect, it } from 'vitest'
import { sql } from '../support/db'
import { makeCrew, type TestCrew } from '../support/people'
import { draftWithLines, sealedSong } from '../support/finish'

let crew: TestCrew
let s: Awaited<ReturnType<typeof sealedSong>>
beforeAll(async () => {
  crew = await makeCrew()
  s = await sealedSong(crew)
})

async function refused(text: string, values: unknown[], message: RegExp) {
  await expect(sql(text, values)).rejects.toThrow(message)
}

describe('a sealed version in the database', () => {
  it('refuses UPDATE and DELETE of the version and its lines', async () => {
    await refused('UPDATE versions SET note = $2 WHERE id = $1', [s.versionId, 'quietly'], /cannot be changed/)
    await refused(`UPDATE versions SET lines = '[]'::jsonb WHERE id = $1`, [s.versionId], /cannot be changed/)
    await refused('DELETE FROM versions WHERE id = $1', [s.versionId], /cannot be deleted/)
    const [v] = await sql('SELECT jsonb_array_length(lines) AS n FROM versions WHERE id = $1', [s.versionId])
    expect(v.n).toBe(5)
  })

  it('refuses deleting its draft or song, even by cascade, with a clear message', async () => {
    await refused('DELETE FROM drafts WHERE id = $1', [s.draftId], /sealed as the final sheet|sealed final sheet/)
    await refused('DELETE FROM songs WHERE id = $1', [s.songId], /sealed/)
    const res = await crew.as.owner.delete(`/api/songs/${s.songId}`)
    expect(res.status).toBe(409)
    expect(res.body.message).toMatch(/sealed .*unseal/i)
    expect((await sql('SELECT count(*)::int AS n FROM songs WHERE id = $1', [s.songId]))[0].n).toBe(1)
  })

  it('refuses a new version on the sealed draft', async () => {
    await refused(`INSERT INTO versions (draft_id, number, doc, lines) VALUES ($1, 99, '{"type":"doc","content":[]}', '[]')`, [s.draftId], /takes no new versions/)
  })

  it('refuses UPDATE and DELETE of the seal and of the split sheet kept in it', async () => {
    await refused('UPDATE seals SET sealed_at = now() - interval \'1 year\' WHERE id = $1', [s.sealId], /A seal never changes/)
    await refused(`UPDATE seals SET split = '[{"userId":null,"name":"Someone else","role":null,"shareBp":10000,"confirmedAt":null}]' WHERE id = $1`, [s.sealId], /A seal never changes/)
    await refused(`UPDATE seals SET signers = '[]' WHERE id = $1`, [s.sealId], /A seal never changes/)
    await refused('DELETE FROM seals WHERE id = $1', [s.sealId], /cannot be deleted/)
    const [seal] = await sql('SELECT split FROM seals WHERE id = $1', [s.sealId])
    expect(seal.split.map((l: any) => l.shareBp)).toEqual([6000, 4000])
  })

  it('refuses a seal whose split does not total 100.00 % or lacks a confirmation', async () => {
    const d = await draftWithLines(crew)
    const split = (bps: number[], confirmed = true) => JSON.stringify(bps.map((bp, i) => ({ userId: i === 0 ? crew.users.writer.id : null, name: `W${i}`, role: null, shareBp: bp, confirmedAt: confirmed ? new Date().toISOString() : null })))
    // 33.33 × 3 = 99.99 % (DOMAIN.md §7: shares are kept in basis points).
    await refused(`INSERT INTO seals (song_id, version_id, signers, split) VALUES ($1, $2, '[]', $3)`, [d.songId, d.versionId, split([3333, 3333, 3333])], /totals 99\.99 %; it must total exactly 100\.00 %/)
    await refused(`INSERT INTO seals (song_id, version_id, signers, split) VALUES ($1, $2, '[]', $3)`, [d.songId, d.versionId, split([5000, 5000], false)], /must confirm their line/)
    await refused(`INSERT INTO seals (song_id, version_id, signers, split) VALUES ($1, $2, '[]', '[]')`, [d.songId, d.versionId], /totals 0\.00 %/)
    await refused(`INSERT INTO seals (song_id, version_id, signers, split) VALUES ($1, $2, '[]', $3)`, [s.songId, s.versionId, split([10_000])], /already has a sealed final sheet/)
  })

  it('keeps the working split sheet at 100.00 % at commit', async () => {
    const [line] = await sql('SELECT id FROM split_lines WHERE song_id = $1 ORDER BY position LIMIT 1', [s.songId])
    await refused('UPDATE split_lines SET share_bp = 5000 WHERE id = $1', [line.id], /totals 90\.00 %/)
    await refused('DELETE FROM split_lines WHERE id = $1', [line.id], /totals 40\.00 %/)
  })

  it('keeps the unseal record, and lets the song go only after unsealing', async () => {
    const unseal = await crew.as.owner.post(`/api/seals/${s.sealId}/unseal`, { reason: 'Moving this song to another crew' })
    expect(unseal.status).toBe(201)
    const [lift] = await sql('SELECT id FROM seal_lifts WHERE seal_id = $1', [s.sealId])
    await refused('UPDATE seal_lifts SET reason = $2 WHERE id = $1', [lift.id, 'a different reason'], /cannot be changed or deleted/)
    await refused('DELETE FROM seal_lifts WHERE id = $1', [lift.id], /cannot be changed or deleted/)
    // A lifted seal is still never changed or deleted directly: it stays as history.
    await refused('UPDATE seals SET pdf_key = null WHERE id = $1', [s.sealId], /A seal never changes/)
    await refused('DELETE FROM seals WHERE id = $1', [s.sealId], /cannot be deleted/)
    await refused('UPDATE versions SET note = $2 WHERE id = $1', [s.versionId, 'still no'], /cannot be changed/)

    const res = await crew.as.owner.delete(`/api/songs/${s.songId}`)
    expect(res.status, res.text).toBe(204)
    const left = await sql('SELECT (SELECT count(*) FROM seals WHERE song_id = $1)::int AS seals, (SELECT count(*) FROM seal_lifts WHERE seal_id = $2)::int AS lifts', [s.songId, s.sealId])
    expect(left[0]).toEqual({ seals: 0, lifts: 0 })
  })
})
