// The producer's journey in Chromium: upload a beat, watch it analysed, see the waveform with
// bars, fix the grid, mark a section and loop it; a listener sees it without edit controls.
import { writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { encodeWav16 } from '../../server/utils/audio/wav'
import { synthBeat } from '../../server/utils/audio/synth'
import { fixtureDir } from '../support/audio-fixtures'
import { launchBrowser, newPage, screenshot, signInDemo } from '../support/browser'
import { asDemo } from '../support/http'

let browser: Browser
let close: () => Promise<void>
beforeAll(async () => ({ browser, close } = await launchBrowser()))
afterAll(async () => close?.())

const lane = (page: Page) => page.getByTestId('beat-lane')
const laneNumber = async (page: Page, attr: string) => Number(await lane(page).getAttribute(attr))

describe('beat room in Chromium', () => {
  let songId: string

  it('the producer uploads a beat, fixes the grid, marks a section and loops it', async () => {
    const beat = synthBeat({ bpm: 90, bars: 12, leadInMs: 600, seed: 77 })
    const file = join(fixtureDir(), 'e2e-90.wav')
    writeFileSync(file, encodeWav16(beat.channelData, beat.sampleRate))

    const { page, context, external, pageErrors } = await newPage(browser)
    await signInDemo(page, 'producer')
    await page.getByTestId('crew-list').getByText('Lamplight Collective').click()
    await page.getByLabel('New song title').fill('Tram Lights')
    await page.getByRole('button', { name: 'Start song' }).click()
    await page.getByTestId('song-title').getByText('Tram Lights').waitFor()
    songId = page.url().split('/songs/')[1]!.split('/')[0]!
    await page.getByRole('link', { name: 'Beat', exact: true }).click()
    await page.getByTestId('no-beat').waitFor()

    // Record every progress state the page shows while the beat is analysed.
    await page.evaluate(() => {
      const w = window as unknown as { seenProgress: string[] }
      w.seenProgress = []
      new MutationObserver(() => {
        for (const el of document.querySelectorAll('[data-testid="analysis-progress"], [data-testid="upload-progress"]')) w.seenProgress.push(el.textContent ?? '')
      }).observe(document.body, { subtree: true, childList: true, characterData: true })
    })
    await page.getByTestId('beat-file').setInputFiles(file)
    await lane(page).waitFor({ timeout: 30_000 })
    const seen = await page.evaluate(() => (window as unknown as { seenProgress: string[] }).seenProgress)
    expect(seen.some(s => /Uploading|waiting|analysing/.test(s)), seen.join(' | ')).toBe(true)

    // The waveform is drawn with a bar ruler: one numbered notch per bar (12 bars).
    const notches = page.locator('[part~="timeline-notch-primary"]')
    await expect.poll(() => notches.count(), { timeout: 10_000 }).toBeGreaterThanOrEqual(12)
    await expect(page.getByTestId('grid-bpm').textContent()).resolves.toBe('90 BPM')
    // The first bounce sets bar 1 from what was heard (0.6 s lead-in): wait for it before editing.
    await page.getByTestId('grid-summary').getByText(/bar 1 at 00:00\.(59|60)/).waitFor()
    await screenshot(page, 'beat-room-producer-laptop')

    // Fix the grid: a typed tempo, then back to the heard one; bar 1 nudged by a millisecond.
    await page.getByLabel('Tempo (BPM)').fill('180')
    await page.getByRole('button', { name: 'Set tempo' }).click()
    await page.getByTestId('grid-summary').getByText('180 BPM').waitFor()
    await page.getByRole('button', { name: '½ ×' }).click()
    await page.getByTestId('grid-summary').getByText('90 BPM').waitFor()
    const before = (await (await asDemo('producer')).get(`/api/songs/${songId}`)).body.grid.offsetMs as number
    await page.getByTestId('nudge-plus-1').click()
    await expect.poll(async () => (await (await asDemo('writer')).get(`/api/songs/${songId}`)).body.grid.offsetMs).toBeCloseTo(before + 1, 3)
    await page.keyboard.press('BracketLeft')
    await expect.poll(async () => (await (await asDemo('writer')).get(`/api/songs/${songId}`)).body.grid.offsetMs).toBeCloseTo(before, 3)

    // Mark a one-bar hook and loop it.
    const form = page.getByTestId('section-form')
    await form.getByLabel('Kind').selectOption('hook')
    await form.getByLabel('From bar').fill('3')
    await form.getByLabel('To bar').fill('3')
    await form.getByRole('button', { name: 'Add section' }).click()
    await page.getByTestId('section-list').getByText('bars 3–3').waitFor()
    // An overlapping section is refused before it is sent, with the reason.
    await form.getByLabel('From bar').fill('2')
    await form.getByLabel('To bar').fill('4')
    await form.getByText(/overlap Hook \(bars 3–3\)/).waitFor()

    await page.getByRole('button', { name: 'Loop Hook' }).click()
    await page.getByTestId('loop-label').getByText('Looping bars 3–3').waitFor()
    await expect.poll(() => laneNumber(page, 'data-loop-wraps'), { timeout: 15_000 }).toBeGreaterThanOrEqual(2)
    // 90 BPM: bar 3 runs from offset + 16/3 s to offset + 8 s (common practice: 60 / BPM × 4 per bar).
    const offset = (await (await asDemo('producer')).get(`/api/songs/${songId}`)).body.grid.offsetMs / 1000
    for (let i = 0; i < 8; i++) {
      const t = await laneNumber(page, 'data-position')
      expect(t).toBeGreaterThanOrEqual(offset + 16 / 3 - 0.05)
      expect(t).toBeLessThanOrEqual(offset + 8 + 0.15)
      const media = await page.evaluate(() => document.querySelector('audio, video')?.getAttribute('src') ?? null)
      expect(media === null || media.includes('/audio')).toBe(true)
      await page.waitForTimeout(250)
    }
    expect(await lane(page).getAttribute('data-bar')).toBe('3')
    await screenshot(page, 'beat-room-looping-laptop')
    await page.keyboard.press('Space')
    await expect.poll(() => lane(page).getAttribute('data-playing')).toBe('false')

    await page.setViewportSize({ width: 390, height: 844 })
    await screenshot(page, 'beat-room-producer-phone')
    expect(external).toEqual([])
    expect(pageErrors).toEqual([])
    await context.close()
  }, 120_000)

  it('shows the listener the beat and the listening caution, without edit controls (phone)', async () => {
    const { page, context, pageErrors } = await newPage(browser, { width: 390, height: 844 })
    await signInDemo(page, 'listener')
    await page.goto(`/songs/${songId}/beat`)
    await lane(page).waitFor()
    await page.getByTestId('listening-caution').waitFor()
    await expect(page.getByTestId('listening-caution').textContent()).resolves.toMatch(/80 dB\(A\) for 40 hours a week/)
    await screenshot(page, 'beat-room-listener-phone')
    await expect(page.getByLabel('Tempo (BPM)').count()).resolves.toBe(0)
    await expect(page.getByTestId('section-form').count()).resolves.toBe(0)
    await expect(page.getByTestId('beat-file').count()).resolves.toBe(0)
    // Dismissed once, it stays away for the session.
    await page.getByRole('button', { name: 'Got it' }).click()
    await page.reload()
    await lane(page).waitFor()
    await expect(page.getByTestId('listening-caution').count()).resolves.toBe(0)
    expect(pageErrors).toEqual([])
    await context.close()
  })

  it('opens the demo song with its seeded beat and sections', async () => {
    const { page, context, pageErrors } = await newPage(browser)
    await signInDemo(page, 'writer')
    await page.getByTestId('crew-list').getByText('Lamplight Collective').click()
    await page.getByTestId('song-list').getByText('Night Bus Home').click()
    // The song opens at the desk, with the beat lane on top; the Beat tab opens the beat room.
    await page.getByTestId('desk').waitFor()
    await lane(page).waitFor()
    await page.getByRole('navigation', { name: 'Song' }).getByRole('link', { name: 'Beat', exact: true }).click()
    await page.getByTestId('section-list').waitFor()
    await lane(page).waitFor()
    for (const name of ['Intro', 'Verse 1', 'Hook', 'Outro']) await page.getByTestId('section-list').locator('.font-lyric').getByText(name, { exact: true }).waitFor()
    await expect(page.getByTestId('grid-summary').textContent()).resolves.toMatch(/^90 BPM · 4\/4/)
    await screenshot(page, 'beat-room-demo-laptop')
    expect(pageErrors).toEqual([])
    await context.close()
  })
})
