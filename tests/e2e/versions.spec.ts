import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { hydrated, launchBrowser, newPage, screenshot, signInDemo } from '../support/browser'
import { asDemo, type ApiClient } from '../support/http'

let browser: Browser
let close: () => Promise<void>
let writer: ApiClient
let crewId: string

beforeAll(async () => {
  ({ browser, close } = await launchBrowser())
  writer = await asDemo('writer')
  crewId = (await writer.get('/api/crews')).body.find((c: any) => c.name === 'Lamplight Collective').id
})
afterAll(async () => close?.())

const LINES = [
  { id: 'e1', bar: 1, text: 'Corner store neon humming in blue' },
  { id: 'e2', bar: 2, text: 'Counting my steps like the rent coming due' },
  { id: 'e3', bar: 3, text: 'Keys in my fist and a song in my chest' },
  { id: 'e4', bar: 4, text: 'Home is a bus and a window to rest' },
]

/** A fresh song in the demo crew with one draft and one version by the demo writer. */
async function freshSong(title: string) {
  const songId = (await writer.post(`/api/crews/${crewId}/songs`, { title })).body.id as string
  const draftId = (await writer.post(`/api/songs/${songId}/drafts`, { name: 'Main' })).body.id as string
  const v1 = (await writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: null, lines: LINES, note: 'First pass' })).body
  return { songId, draftId, v1Id: v1.id as string }
}

const lineText = (page: Page, id: string) => page.locator(`[data-row-line="${id}"]`).getByTestId('line-text')

/** Replaces a line's text at the desk as a writer types it: select the line, type over it. */
async function retype(page: Page, id: string, text: string) {
  await lineText(page, id).click()
  await page.keyboard.press('End')
  await page.keyboard.press('Shift+Home')
  await page.keyboard.type(text)
}

describe('alts live, as two people at once', () => {
  it('the co-writer proposes an alt, the writer sees it appear, takes it, and the co-writer sees the new line', async () => {
    const { songId } = await freshSong('Two at once')
    const co = await newPage(browser)
    const wr = await newPage(browser)
    await signInDemo(co.page, 'cowriter')
    await signInDemo(wr.page, 'writer')
    await co.page.goto(`/songs/${songId}`)
    await wr.page.goto(`/songs/${songId}`)
    await lineText(co.page, 'e2').waitFor()
    await lineText(wr.page, 'e2').waitFor()
    // Each sees the other on the song.
    await co.page.getByTestId('live-presence').locator('[data-user="Ivy Sato"]').waitFor()
    await wr.page.getByTestId('live-presence').locator('[data-user="Theo Ruiz"]').waitFor()
    // A co-writer gets a read-only desk.
    await co.page.getByTestId('desk-readonly').waitFor()
    expect(await co.page.getByTestId('desk-editor').getAttribute('contenteditable')).toBe('false')
    expect(await co.page.getByTestId('saver-status').count()).toBe(0)

    // Clicking a line opens its panel beside the page.
    await lineText(co.page, 'e2').click()
    const panel = co.page.getByTestId('alts-panel-e2')
    await panel.getByLabel('Propose an alt for bar 2').fill('Counting my steps till the sky turns to blue')
    await panel.getByRole('button', { name: 'Propose alt' }).click()
    await panel.getByTestId('alt-text').getByText('Counting my steps till the sky turns to blue').waitFor()
    expect(await panel.getByRole('button', { name: 'Take' }).count()).toBe(0)

    // The writer did not reload: the count on bar 2 goes to 1 by itself.
    await wr.page.getByTestId('alts-toggle-e2').getByText('1').waitFor({ timeout: 10_000 })
    await wr.page.getByTestId('alts-toggle-e2').click()
    const writerPanel = wr.page.getByTestId('alts-panel-e2')
    await writerPanel.getByText('Counting my steps till the sky turns to blue').waitFor()
    await writerPanel.getByText('by Theo Ruiz').waitFor()
    // The prosody engine's figures beside the alt: its syllables and the rhyme family.
    await writerPanel.getByTestId('alt-syllables').waitFor()
    await writerPanel.getByTestId('line-figures').waitFor()
    await screenshot(wr.page, 'alts-writer-sees-alt')
    await writerPanel.getByRole('button', { name: 'Up' }).click()
    await writerPanel.getByRole('button', { name: 'Up' }).and(wr.page.locator('[aria-pressed="true"]')).waitFor()
    await writerPanel.getByRole('button', { name: 'Take' }).click()
    await wr.page.getByText('Alt taken: version 2 holds the new line.').waitFor()
    await lineText(wr.page, 'e2').getByText('Counting my steps till the sky turns to blue').waitFor()

    // The co-writer's page follows without a reload.
    await lineText(co.page, 'e2').getByText('Counting my steps till the sky turns to blue').waitFor({ timeout: 10_000 })
    await co.page.getByTestId('desk-version').getByText('version 2').waitFor()
    // Its figures follow too: coun·ting my steps till the sky turns to blue = 10 syllables (CMU Pronouncing Dictionary).
    const taken = co.page.locator('[data-row-line="e2"]')
    await expect.poll(() => taken.getByTestId('line-syllables').textContent(), { timeout: 10_000 }).toBe('10')
    await screenshot(co.page, 'alts-cowriter-sees-new-line')
    for (const p of [co, wr]) {
      expect(p.external).toEqual([])
      expect(p.pageErrors).toEqual([])
    }
    await co.context.close()
    await wr.context.close()
  })
})

describe('unsaved text is never lost', () => {
  it('survives a dropped connection and a reload, then saves once the server answers', async () => {
    const { songId, draftId } = await freshSong('Dropped connection')
    const { page, context, pageErrors } = await newPage(browser)
    await signInDemo(page, 'writer')
    await page.goto(`/songs/${songId}`)
    await hydrated(page)
    await lineText(page, 'e3').waitFor()
    // Saves get no answer: as if the connection dropped.
    const drop = (route: any) => (route.request().method() === 'POST' ? route.abort('internetdisconnected') : route.continue())
    await page.route('**/api/drafts/*/versions', drop)
    await retype(page, 'e3', 'Keys in my fist and a hook in my chest')
    await page.getByRole('button', { name: 'Save version' }).click()
    await page.getByTestId('saver-status').getByText('Offline').waitFor()
    await screenshot(page, 'saver-offline')

    await page.reload()
    await hydrated(page)
    await page.getByTestId('saver-restored').waitFor()
    expect(await lineText(page, 'e3').textContent()).toBe('Keys in my fist and a hook in my chest')

    await page.unroute('**/api/drafts/*/versions', drop)
    await page.getByTestId('saver-status').getByText('All saved').waitFor({ timeout: 15_000 })
    const head = (await writer.get(`/api/drafts/${draftId}`)).body.headVersionId
    const saved = (await writer.get(`/api/versions/${head}`)).body
    expect(saved.number).toBe(2)
    expect(saved.lines.find((l: any) => l.id === 'e3').text).toBe('Keys in my fist and a hook in my chest')
    expect(await page.evaluate(id => localStorage.getItem(`barsmith:unsaved:${id}`), draftId)).toBeNull()
    expect(pageErrors).toEqual([])
    await context.close()
  })

  it('a save refused as stale opens the merge view; the merged text becomes a new version', async () => {
    const { songId, draftId, v1Id } = await freshSong('Merge me')
    const { page, context, pageErrors } = await newPage(browser)
    await signInDemo(page, 'writer')
    await page.goto(`/songs/${songId}`)
    await hydrated(page)
    await lineText(page, 'e1').waitFor()
    const owner = await asDemo('owner')
    // The writer starts typing (unsaved text is never replaced by someone else's save)…
    await retype(page, 'e1', 'Corner store neon is humming the blues')
    // …meanwhile the owner saves a change to bar 4.
    const theirs = await owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: v1Id, lines: LINES.map(l => (l.id === 'e4' ? { ...l, text: 'Home is a bus and the window my rest' } : l)) })
    expect(theirs.status).toBe(201)
    await page.getByRole('button', { name: 'Save version' }).click()
    const merge = page.getByTestId('merge-view')
    await merge.waitFor()
    await page.getByTestId('saver-status').getByText('Someone saved first').waitFor()
    // Bar 1 changed only here, bar 4 only there: both are suggested as they are.
    await merge.getByTestId('merge-row').first().waitFor()
    await expect(merge.getByTestId('merge-row').count()).resolves.toBe(2)
    await screenshot(page, 'merge-view')
    await merge.getByRole('button', { name: 'Save merged version' }).click()
    await page.getByTestId('saver-status').getByText('All saved').waitFor()

    const head = (await writer.get(`/api/drafts/${draftId}`)).body.headVersionId
    const merged = (await writer.get(`/api/versions/${head}`)).body
    expect(merged).toMatchObject({ number: 3, kind: 'merge' })
    expect(merged.lines.map((l: any) => l.text)).toEqual(['Corner store neon is humming the blues', LINES[1]!.text, LINES[2]!.text, 'Home is a bus and the window my rest'])
    expect((await writer.get(`/api/drafts/${draftId}/side-saves`)).body).toEqual([])
    expect(pageErrors).toEqual([])
    await context.close()
  })
})

describe('history of the demo song', () => {
  it('lists versions by different members, shows a diff with bars, compares two drafts and restores as a new version', async () => {
    const { page, context, external, pageErrors } = await newPage(browser, { width: 1400, height: 900 })
    await signInDemo(page, 'writer')
    await page.getByText('Lamplight Collective').click()
    await page.getByTestId('song-list').getByText('Night Bus Home').click()
    await page.getByRole('navigation', { name: 'Song' }).getByRole('link', { name: 'History' }).click()
    const list = page.getByTestId('version-list')
    await list.waitFor()
    await list.getByTestId('version-4').getByText('Verse done').waitFor()
    await list.getByTestId('version-3').getByText('Dana Okoro').waitFor()
    await list.getByTestId('version-1').getByText('Ivy Sato').waitFor()
    // Head (v4) against its parent (v3): the verse's second half was added on bars 21–28.
    const diff = page.getByTestId('version-diff')
    await diff.getByTestId('diff-stats').getByText('8 added').waitFor()
    await diff.locator('[data-kind="added"]').first().getByText('21').waitFor()
    await screenshot(page, 'history-diff')

    // Version 1 → 3 shows the reworded hook lines with their bars.
    await list.getByTestId('version-3').getByLabel('to').check()
    await list.getByTestId('version-1').getByLabel('from').check()
    await diff.getByText('Version 1 → version 3').waitFor()
    const bar10 = diff.locator('[data-kind="changed"]').filter({ has: page.getByTitle('Bar 10', { exact: true }) })
    await bar10.locator('ins').filter({ hasText: 'came' }).waitFor()
    await bar10.locator('del').filter({ hasText: 'same' }).waitFor()
    await screenshot(page, 'history-diff-v1-v3')

    await page.getByRole('button', { name: 'Compare drafts' }).click()
    const compare = page.getByTestId('draft-compare')
    await compare.waitFor()
    // Main against the seeded slower take (other tests may add drafts of their own to the demo song).
    const slower = await compare.getByTestId('compare-right').locator('option', { hasText: 'Hook, slower take' }).getAttribute('value')
    await compare.getByTestId('compare-right').selectOption(slower!)
    await page.waitForURL(url => url.searchParams.get('right') === slower)
    await compare.locator('tr[data-same="false"]').first().waitFor()
    // Bars 7 and 11 (the slower hook), 17 (reworded later in Main) and 21–28 (only Main has them).
    await expect.poll(() => compare.locator('tr[data-same="false"]').count(), { timeout: 10_000 }).toBe(11)
    await screenshot(page, 'history-compare-drafts')

    await page.getByRole('button', { name: 'Versions' }).click()
    page.once('dialog', d => void d.accept())
    await list.getByTestId('version-2').getByRole('button', { name: 'Restore as new version' }).click()
    await page.getByText('Version 2 restored as version 5. History is unchanged.').waitFor()
    await list.getByTestId('version-5').getByText('Restored version 2').waitFor()
    await list.getByTestId('version-4').waitFor()
    expect(external).toEqual([])
    expect(pageErrors).toEqual([])
    await context.close()
  })

  it('the writer sees the demo alt in the inbox and opens its line', async () => {
    const { page, context, pageErrors } = await newPage(browser)
    await signInDemo(page, 'writer')
    const badge = page.getByTestId('notifications-badge')
    await badge.getByText(/\d+/).waitFor()
    await badge.click()
    await page.getByTestId('notification-list').getByText('New alt on your line in “Night Bus Home”').click()
    const panel = page.getByTestId('alts-panel-nbh-v6')
    await panel.getByText('Coins in my coat and a song to confess').waitFor()
    await panel.getByText('by Theo Ruiz').waitFor()
    await screenshot(page, 'lines-demo-alt')
    expect(pageErrors).toEqual([])
    await context.close()
  })
})
