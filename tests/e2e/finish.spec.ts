// Finishing a song in Chromium: the printable final sheet, and the sign-off journey of three
// demo members from request to a sealed sheet mailed as a PDF.
import { execFileSync } from 'node:child_process'
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { ARTIFACTS, launchBrowser, newPage, screenshot, signInDemo, type TestPage } from '../support/browser'
import { asDemo, DEMO_EMAILS } from '../support/http'
import { attachmentPath, waitForMail } from '../support/mail'

let browser: Browser
let close: () => Promise<void>
beforeAll(async () => ({ browser, close } = await launchBrowser()))
afterAll(async () => close?.())

/** Waits until Vue has mounted, so clicks reach their handlers. */
async function hydrated(page: Page) {
  await page.waitForFunction(() => !!(document.querySelector('#__nuxt') as any)?.__vue_app__)
}

async function open(page: Page, path: string) {
  await page.goto(path)
  await hydrated(page)
}

async function demoSongId(title: string) {
  const client = await asDemo('listener')
  const [crew] = (await client.get('/api/crews')).body
  const songs = (await client.get(`/api/crews/${crew.id}/songs`)).body
  return { crewId: crew.id as string, songId: songs.find((s: any) => s.title === title).id as string }
}

describe('the final sheet in Chromium', () => {
  it('shows the sealed demo song ready to print, on a laptop, a phone and paper; a listener can print but not sign', async () => {
    const { songId } = await demoSongId('Kell Street Lanterns')
    const t = await newPage(browser)
    await signInDemo(t.page, 'listener')
    await open(t.page, `/songs/${songId}/sheet`)
    const sheet = t.page.getByTestId('final-sheet')
    await sheet.getByRole('heading', { name: 'Kell Street Lanterns' }).waitFor()
    await t.page.getByTestId('seal-stamp').waitFor()
    expect(await sheet.getByText('rain talk again').count()).toBe(0)
    expect(await t.page.getByTestId('sheet-line').count()).toBe(34)
    await t.page.getByText('1 line is marked out and not printed.').waitFor()
    await sheet.getByText(/Not legal advice/).waitFor()
    await t.page.getByRole('button', { name: 'Print' }).waitFor()
    expect(await t.page.getByRole('link', { name: 'PDF' }).getAttribute('href')).toMatch(/\/sheet\.pdf$/)
    expect(await t.page.getByRole('button', { name: 'Mark lines out' }).count()).toBe(0)
    await screenshot(t.page, 'sheet-sealed-laptop')

    await t.page.emulateMedia({ media: 'print' })
    expect(await t.page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false)
    expect(await t.page.getByRole('navigation', { name: 'Song' }).isVisible()).toBe(false)
    await screenshot(t.page, 'sheet-sealed-print')
    await t.page.emulateMedia({ media: 'screen' })

    await open(t.page, `/songs/${songId}/signoff`)
    await t.page.getByTestId('sealed-card').waitFor()
    expect(await t.page.getByRole('button', { name: /Approve|Decline|Ask for sign-off|Unseal/ }).count()).toBe(0)
    expect(t.external).toEqual([])
    expect(t.pageErrors).toEqual([])
    await t.context.close()

    const phone = await newPage(browser, { width: 390, height: 844 })
    await signInDemo(phone.page, 'writer')
    await open(phone.page, `/songs/${songId}/sheet`)
    await phone.page.getByTestId('seal-stamp').waitFor()
    await screenshot(phone.page, 'sheet-sealed-phone')
    // The first screen as a phone shows it, not the whole scroll.
    await phone.page.screenshot({ path: `${ARTIFACTS}/sheet-sealed-phone-top.png` })
    await open(phone.page, `/songs/${songId}/activity`)
    await phone.page.getByTestId('activity-list').getByText(/was sealed as the final sheet/).waitFor()
    await screenshot(phone.page, 'activity-phone')
    expect(phone.pageErrors).toEqual([])
    await phone.context.close()
  })
})

const LINES = [
  { id: 'j1', bar: 1, text: 'Tin roof talking when the weather comes' },
  { id: 'j2', bar: 2, text: 'I tap the rhythm out with restless thumbs (tap)' },
  { id: 'j3', bar: 3, text: 'gutter overflowing like the words I keep' },
  { id: 'j4', bar: 4, text: 'one too many syllables crammed into this beat' },
  { id: 'j5', bar: 4, text: 'so the bar gets crowded' },
  { id: 'j6', bar: 5, text: '(rain, rain) let it fall on the street' },
]

describe('the sign-off journey in Chromium', () => {
  it('request → a decline → a new version → request again → all approve → sealed, and the PDF arrives by mail', { timeout: 180_000 }, async () => {
    const title = `Tin Roof Weather ${randomUUID().slice(0, 4)}`
    const writerApi = await asDemo('writer')
    const [crew] = (await writerApi.get('/api/crews')).body
    const songId = (await writerApi.post(`/api/crews/${crew.id}/songs`, { title })).body.id
    const draftId = (await writerApi.post(`/api/songs/${songId}/drafts`, { name: 'Main take' })).body.id
    expect((await writerApi.post(`/api/drafts/${draftId}/versions`, { baseVersionId: null, lines: LINES })).status).toBe(201)

    const pages: TestPage[] = []
    const as = async (role: 'writer' | 'producer' | 'owner') => {
      const t = await newPage(browser)
      pages.push(t)
      await signInDemo(t.page, role)
      return t.page
    }
    const writer = await as('writer')
    const producer = await as('producer')
    const owner = await as('owner')

    // The split sheet: the writer fills it in, each listed member confirms their own line.
    await open(writer, `/songs/${songId}/splits`)
    await writer.getByTestId('split-caution').getByText('Not legal advice.').waitFor()
    await writer.getByRole('button', { name: 'Edit the split sheet' }).click()
    await writer.getByRole('button', { name: 'Add a writer' }).click()
    await writer.getByLabel('Writer 1: crew member').selectOption({ label: 'Ivy Sato (writer)' })
    await writer.getByLabel('Writer 1: role').fill('lyrics')
    await writer.getByLabel('Writer 1: share in per cent').fill('33.33')
    await writer.getByLabel('Writer 2: crew member').selectOption({ label: 'Milo Brandt (producer)' })
    await writer.getByLabel('Writer 2: share in per cent').fill('33.33')
    await writer.getByRole('button', { name: 'Add a writer' }).click()
    await writer.getByLabel('Writer 3: name').fill('Rae Calloway')
    await writer.getByLabel('Writer 3: share in per cent').fill('33.33')
    await writer.getByTestId('split-total').getByText('Total 99.99 %').waitFor()
    await writer.getByRole('button', { name: 'Save split sheet' }).click()
    await writer.getByTestId('split-message').getByText('The shares total 99.99 %; they must total exactly 100.00 % (0.01 short).').waitFor()
    await screenshot(writer, 'split-refused-laptop')
    await writer.getByLabel('Writer 3: share in per cent').fill('33.34')
    await writer.getByTestId('split-total').getByText('Total 100.00 %').waitFor()
    await writer.getByRole('button', { name: 'Save split sheet' }).click()
    await writer.getByRole('button', { name: 'Confirm my line (33.33 %)' }).click()
    await writer.getByTestId('split-message').getByText('Your line is confirmed.').waitFor()
    await screenshot(writer, 'split-sheet-laptop')
    await open(producer, `/songs/${songId}/splits`)
    await producer.getByRole('button', { name: 'Confirm my line (33.33 %)' }).click()
    await producer.getByText('Ready: the shares total 100.00 % and every listed member confirmed.').waitFor()

    // 1. The writer asks; the owner adds themself to the signers.
    await open(writer, `/songs/${songId}/signoff`)
    await writer.getByRole('button', { name: 'Ask for sign-off on version 1' }).click()
    await writer.getByTestId('open-signoff').waitFor()
    await open(owner, `/songs/${songId}/signoff`)
    await owner.getByRole('checkbox', { name: /Dana Okoro/ }).check()
    await owner.getByRole('button', { name: 'Save signers' }).click()
    await owner.getByTestId('signer-list').locator('[data-signer="Dana Okoro"]').waitFor()

    // 2. The producer declines with a comment, then marks the crowded line out: a new version.
    await open(producer, `/songs/${songId}/signoff`)
    await producer.getByLabel('Your comment').fill('Bar 4 is crowded: the second line there stays out.')
    await producer.getByRole('button', { name: 'Decline' }).click()
    await producer.getByTestId('signoff-message').getByText('You declined; the sign-off is closed.').waitFor()
    await producer.getByTestId('signoff-history').getByText(/Declined by Milo Brandt: Bar 4 is crowded/).waitFor()
    await open(producer, `/songs/${songId}/sheet`)
    await producer.getByRole('button', { name: 'Mark lines out' }).click()
    await producer.getByTestId('mark-list').getByRole('checkbox', { name: /so the bar gets crowded/ }).check()
    await producer.getByRole('button', { name: 'Save as a new version' }).click()
    await producer.getByText('Saved as version 2.').waitFor()
    await producer.getByTestId('final-sheet').getByText('so the bar gets crowded').waitFor({ state: 'detached' })
    await producer.getByText('1 line is marked out and not printed.').waitFor()

    // 3. The writer asks again on version 2; the owner adds themself again.
    await open(writer, `/songs/${songId}/signoff`)
    await writer.getByRole('button', { name: 'Ask for sign-off on version 2' }).click()
    await writer.getByTestId('open-signoff').getByRole('heading', { name: /Version 2/ }).waitFor()
    await open(owner, `/songs/${songId}/signoff`)
    await owner.getByRole('checkbox', { name: /Dana Okoro/ }).check()
    await owner.getByRole('button', { name: 'Save signers' }).click()
    await owner.getByTestId('signer-list').locator('[data-signer="Dana Okoro"]').waitFor()

    // 4. Everyone approves; the last approval seals.
    await owner.getByLabel('Your comment').fill('Approved for the crew.')
    await owner.getByRole('button', { name: 'Approve' }).click()
    await owner.getByTestId('signoff-message').getByText('You approved.').waitFor()
    await open(producer, `/songs/${songId}/signoff`)
    await producer.getByLabel('Your comment').fill('Bar 4 breathes now.')
    await producer.getByRole('button', { name: 'Approve' }).click()
    await producer.getByTestId('signoff-message').getByText('You approved.').waitFor()
    await screenshot(producer, 'signoff-open-laptop')
    await open(writer, `/songs/${songId}/signoff`)
    await writer.getByRole('button', { name: 'Approve' }).click()
    await writer.getByTestId('signoff-message').getByText(/the sheet is sealed/).waitFor()
    await writer.getByTestId('sealed-card').getByRole('heading', { name: 'Version 2 of "Main take"' }).waitFor()
    await screenshot(writer, 'signoff-sealed-laptop')
    await open(writer, `/songs/${songId}/sheet`)
    await writer.getByTestId('seal-stamp').waitFor()

    // 5. Every member gets the PDF; Debian's pdftotext reads it back.
    const mail = await waitForMail(DEMO_EMAILS.writer, m => m.subject === `Sealed: "${title}", version 2`)
    expect(mail.attachments).toHaveLength(1)
    expect(mail.attachments[0]).toMatchObject({ contentType: 'application/pdf' })
    const text = execFileSync('pdftotext', ['-layout', attachmentPath(mail), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ')
    let from = 0
    for (const l of LINES.filter(x => x.id !== 'j5')) {
      const at = text.indexOf(l.text, from)
      expect(at, l.text).toBeGreaterThan(-1)
      from = at + l.text.length
    }
    expect(text).not.toContain('so the bar gets crowded')
    expect(text).toContain('version 2, sealed')
    await waitForMail(DEMO_EMAILS.listener, m => m.subject === `Sealed: "${title}", version 2` && m.attachments.length === 1)

    for (const t of pages) {
      expect(t.external).toEqual([])
      expect(t.pageErrors).toEqual([])
      await t.context.close()
    }
  })
})
