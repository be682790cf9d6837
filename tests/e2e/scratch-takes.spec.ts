// Scratch takes in Chromium with its synthetic microphone: record over the demo beat, see the
// take at its bar, hear it scheduled at the bar's time on the grid, rename it, delete it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser, newPage, screenshot, signInDemo } from '../support/browser'
import { asDemo } from '../support/http'

let browser: Browser
let close: () => Promise<void>
beforeAll(async () => ({ browser, close } = await launchBrowser({ fakeMedia: true })))
afterAll(async () => close?.())

const takeAt = (page: Page, bar: number) => page.locator(`[data-testid="take"][data-bar="${bar}"]`)

describe('scratch takes in Chromium', () => {
  it('the writer records a take at bar 5, hears it on its bar, renames and deletes it', async () => {
    const writer = await asDemo('writer')
    const [crew] = (await writer.get('/api/crews')).body
    const song = (await writer.get(`/api/crews/${crew.id}/songs`)).body.find((s: any) => s.title === 'Night Bus Home')
    const { grid } = (await writer.get(`/api/songs/${song.id}`)).body

    const { page, external, pageErrors } = await newPage(browser)
    await signInDemo(page, 'writer')
    await page.goto(`/songs/${song.id}/beat`)
    await page.getByTestId('beat-lane').waitFor()
    await page.getByTestId('scratch-takes').waitFor()
    await page.locator('[data-testid="beat-lane"][data-playing="false"]').waitFor()

    // Stopped: Record starts the beat at the chosen bar and records from there.
    await page.getByTestId('take-from').fill('5')
    await page.getByTestId('take-record').click()
    await page.getByTestId('take-recording').waitFor()
    expect(await page.getByTestId('take-recording').textContent()).toMatch(/Recording from bar 5/)
    await page.waitForTimeout(1500)
    await page.getByTestId('take-stop').click()
    const take = takeAt(page, 5)
    await take.waitFor({ timeout: 15_000 })
    expect(await take.getByTestId('take-name').textContent()).toMatch(/^Take at bar 5/)

    // Scheduled at bar 5's start: offset + (5 − 1) × beatsPerBar × 60 / BPM (DOMAIN.md §1, arithmetic).
    const expected = Math.round(grid.offsetMs + 4 * grid.beatsPerBar * 60_000 / grid.bpm)
    expect(Number(await take.getAttribute('data-start-ms'))).toBe(expected)
    const stored = (await writer.get(`/api/songs/${song.id}/takes`)).body.find((t: any) => t.bar === 5)
    expect(stored).toMatchObject({ format: 'webm', mimeType: 'audio/webm', authorName: expect.any(String) })
    expect(stored.durationMs).toBeGreaterThan(1000)

    // Played from its bar, the take sounds along with the beat.
    await take.getByRole('button', { name: 'Play from its bar' }).click()
    await page.locator('[data-testid="take"][data-bar="5"][data-playing="true"]').waitFor({ timeout: 10_000 })
    expect(await page.getByTestId('beat-lane').getAttribute('data-playing')).toBe('true')
    await screenshot(page, 'scratch-takes-laptop')
    await page.getByTestId('play').click()
    await page.locator('[data-testid="take"][data-bar="5"][data-playing="false"]').waitFor()

    await take.getByTestId('take-rename').click()
    await page.getByTestId('take-name-input').fill('Hook hum, rough')
    await page.getByTestId('take-name-save').click()
    await page.locator('[data-testid="take-name"]', { hasText: 'Hook hum, rough' }).waitFor()

    await take.getByTestId('take-delete').click()
    await take.waitFor({ state: 'detached' })
    expect((await writer.get(`/api/songs/${song.id}/takes`)).body.some((t: any) => t.id === stored.id)).toBe(false)
    expect(external).toEqual([])
    expect(pageErrors).toEqual([])
  })

  it('while the beat plays, a recording waits for the next bar line and is pinned to that bar', async () => {
    const writer = await asDemo('writer')
    const [crew] = (await writer.get('/api/crews')).body
    const song = (await writer.get(`/api/crews/${crew.id}/songs`)).body.find((s: any) => s.title === 'Night Bus Home')
    const { page, pageErrors } = await newPage(browser, { width: 390, height: 844 })
    await signInDemo(page, 'writer')
    await page.goto(`/songs/${song.id}/beat`)
    await page.getByTestId('beat-lane').waitFor()
    await page.getByTestId('play').click()
    await page.locator('[data-testid="beat-lane"][data-playing="true"]').waitFor()
    await page.getByTestId('take-record').click()
    const status = page.getByRole('status').filter({ hasText: 'Recording starts on bar' })
    const armed = Number(/bar (\d+)/.exec((await status.textContent())!)![1])
    expect(armed).toBeGreaterThanOrEqual(1)
    await page.getByTestId('take-recording').waitFor({ timeout: 10_000 })
    expect(await page.getByTestId('take-recording').textContent()).toContain(`from bar ${armed}`)
    await page.waitForTimeout(1000)
    await page.getByTestId('take-stop').click()
    await takeAt(page, armed).waitFor({ timeout: 15_000 })
    await screenshot(page, 'scratch-takes-phone')
    await takeAt(page, armed).getByTestId('take-delete').click()
    await takeAt(page, armed).waitFor({ state: 'detached' })
    expect(pageErrors).toEqual([])
  })
})
