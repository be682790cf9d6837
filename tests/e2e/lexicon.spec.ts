// A writer teaches Barsmith a word on the crew lexicon page and sees the syllable count change.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launchBrowser, newPage, screenshot, signInDemo } from '../support/browser'

let browser: Browser
let close: () => Promise<void>
beforeAll(async () => ({ browser, close } = await launchBrowser()))
afterAll(async () => close?.())

describe('crew lexicon in Chromium', () => {
  it('a writer teaches a word and the count changes in the try-it area', async () => {
    const { page, context, external, pageErrors } = await newPage(browser)
    await signInDemo(page, 'writer')
    await page.getByTestId('crew-list').getByText('Lamplight Collective').click()
    await page.getByRole('link', { name: 'Lexicon' }).click()
    await page.getByRole('heading', { name: 'Lexicon' }).waitFor()
    // The demo crew's own words are listed
    await page.getByTestId('lexicon-list').getByText('skrt', { exact: true }).waitFor()

    await page.getByLabel('Paste or type lines').fill('the zorbleen glow (skrt)')
    const word = page.getByTestId('try-it-lines').locator('[data-source]', { hasText: 'zorbleen' })
    await word.waitFor()
    expect(await word.getAttribute('data-source')).toBe('guess')
    const count = page.getByTestId('count-t1').locator('.font-semibold')
    const before = Number(await count.textContent())
    // "skrt" is the crew's (counted apart as an ad-lib)
    await page.getByTestId('try-it-lines').locator('[data-source="lexicon"]', { hasText: 'skrt' }).waitFor()

    // Clicking the guessed word fills the teach form; teach it as three dictionary words
    await word.click()
    await expect(page.locator('#field-teach-word').inputValue()).resolves.toBe('zorbleen')
    await page.getByLabel('Sounds like', { exact: true }).fill('sore bee lean')
    await page.getByTestId('teach-preview').getByText('3 syllables').waitFor()
    await page.getByRole('button', { name: 'Teach word' }).click()
    await page.getByText('Barsmith now says “zorbleen” in 3 syllables.').waitFor()

    await page.getByTestId('try-it-lines').locator('[data-source="lexicon"]', { hasText: 'zorbleen' }).waitFor()
    await page.waitForFunction(() => document.querySelector('[data-testid="count-t1"] .font-semibold')?.textContent === '5')
    expect(before).not.toBe(5)
    await page.getByTestId('lexicon-list').getByText('zorbleen', { exact: true }).waitFor()
    await screenshot(page, 'lexicon-writer-teaches')

    // The rhyme finder offers the crew's words with the dictionary's
    await page.goto(page.url().replace(/lexicon$/, 'rhymes?q=hurt'))
    await page.getByTestId('rhymes-perfect').getByRole('button', { name: 'skrt', exact: true }).waitFor()
    await screenshot(page, 'rhyme-finder-writer')
    expect(external).toEqual([])
    expect(pageErrors).toEqual([])
    await context.close()
  })
})
