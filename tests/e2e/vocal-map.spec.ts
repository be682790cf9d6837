// The producer's main screen in Chromium: the demo song's vocal map, a bar opened at the
// desk, and a line marked out from the map (on a song of its own, so the demo stays as seeded).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { hydrated, launchBrowser, newPage, screenshot, signInDemo } from '../support/browser'
import { asDemo } from '../support/http'

let browser: Browser
let close: () => Promise<void>
beforeAll(async () => ({ browser, close } = await launchBrowser()))
afterAll(async () => close?.())

const cell = (page: Page, bar: number) => page.locator(`[data-testid="map-bar"][data-bar="${bar}"]`)

async function songIdOf(title: string) {
  const producer = await asDemo('producer')
  const [crew] = (await producer.get('/api/crews')).body
  return { producer, crewId: crew.id as string, songId: ((await producer.get(`/api/crews/${crew.id}/songs`)).body.find((s: any) => s.title === title)?.id) as string }
}

describe('vocal map in Chromium', () => {
  it('the producer sees the hook carrying vocals, the intro open, and opens a bar at the desk', async () => {
    const { songId } = await songIdOf('Night Bus Home')
    const { page, external, pageErrors } = await newPage(browser)
    await signInDemo(page, 'producer')
    await page.goto(`/songs/${songId}`)
    await hydrated(page)
    await page.getByRole('link', { name: 'Vocal map', exact: true }).click()
    await page.getByTestId('vocal-map').waitFor()
    await page.getByTestId('beat-lane').waitFor()
    for (const bar of [1, 2, 3, 4]) expect(await cell(page, bar).getAttribute('data-state')).toBe('open')
    for (const bar of [5, 6, 7, 8, 9, 10, 11, 12]) expect(await cell(page, bar).getAttribute('data-state')).toBe('vocals')
    const hook = page.locator('[data-testid="map-row"][data-row="Hook"]')
    expect(await hook.locator('[data-total="bars"]').textContent()).toBe('8')
    expect(await hook.locator('[data-total="lines"]').textContent()).toBe('8')
    expect(await hook.locator('[data-total="rhymeDensity"]').textContent()).toMatch(/^\d+(\.\d+)?$/)

    // Keyboard focus shows the figures: bar 5 has 10 sung syllables (CMU Pronouncing Dictionary counts).
    await cell(page, 4).focus()
    await page.keyboard.press('Tab')
    const tip = cell(page, 5).getByRole('tooltip')
    await tip.waitFor()
    expect(await tip.getByTestId('map-syllables').textContent()).toBe('10')
    expect(await cell(page, 5).getAttribute('aria-label')).toMatch(/^Bar 5: vocals; 10 syllables/)
    await screenshot(page, 'vocal-map-laptop')
    // So does hovering with the mouse.
    await cell(page, 13).hover()
    await cell(page, 13).getByRole('tooltip').waitFor()

    await cell(page, 9).click()
    await page.waitForURL(url => url.pathname === `/songs/${songId}` && url.searchParams.get('bar') === '9')
    await page.getByTestId('song-title').waitFor()

    // The same map at a phone's width.
    const phone = await newPage(browser, { width: 390, height: 844 })
    await signInDemo(phone.page, 'producer')
    await phone.page.goto(`/songs/${songId}/map`)
    await cell(phone.page, 12).waitFor()
    await screenshot(phone.page, 'vocal-map-phone')
    expect(external).toEqual([])
    expect(phone.external).toEqual([])
    expect([...pageErrors, ...phone.pageErrors]).toEqual([])
  })

  it('the producer marks a line out from the map and the map redraws', async () => {
    const { crewId } = await songIdOf('Night Bus Home')
    const writer = await asDemo('writer')
    const songId = (await writer.post(`/api/crews/${crewId}/songs`, { title: 'Map mark-out' })).body.id
    const draft = (await writer.post(`/api/songs/${songId}/drafts`, { name: 'Main' })).body
    await writer.post(`/api/drafts/${draft.id}/versions`, {
      baseVersionId: null,
      lines: [
        { id: 'mo1', bar: 1, text: 'cold rain on the late train' },
        { id: 'mo2', bar: 2, text: 'we ride the last bus home tonight' },
      ],
    })
    const { page, pageErrors } = await newPage(browser)
    await signInDemo(page, 'producer')
    await page.goto(`/songs/${songId}/map`)
    await cell(page, 2).waitFor()
    await hydrated(page)
    expect(await cell(page, 2).getAttribute('data-state')).toBe('vocals')
    await page.getByTestId('map-mark-mode').click()
    await cell(page, 2).click()
    await page.getByTestId('map-mark-panel').waitFor()
    await page.getByTestId('map-toggle-out-mo2').click()
    await page.waitForFunction(() => document.querySelector('[data-testid="map-bar"][data-bar="2"]')?.getAttribute('data-state') === 'open')
    expect(await cell(page, 2).getByTestId('map-out-tally').textContent()).toBe('1')
    expect(await page.getByTestId('map-toggle-out-mo2').textContent()).toMatch(/Bring back in/)
    expect(await page.locator('[data-testid="map-row"]').first().locator('[data-total="lines"]').textContent()).toMatch(/^1 \(1 out\)$/)
    await screenshot(page, 'vocal-map-marked-out')
    const versions = (await writer.get(`/api/drafts/${draft.id}/versions`)).body
    expect(versions[0]).toMatchObject({ number: 2, note: 'Marked 1 line out' })
    expect(pageErrors).toEqual([])
  })
})
