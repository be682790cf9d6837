// In Chromium: every page (discovered from app/pages, filled with the demo crew's ids) loads
// under the content security policy without one violation, signed in and signed out; and
// lyric text with markup saved through the versions route shows as text in the rooms that
// show lyrics, with no script run.
import { randomUUID } from 'node:crypto'
import { readdirSync, statSync } from 'node:fs'
import { resolve } from 'node:path'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { hydrated, launchBrowser, newPage, screenshot, signInDemo } from '../support/browser'
import { asDemo, type ApiClient } from '../support/http'

let browser: Browser
let close: () => Promise<void>
let owner: ApiClient
let ids: Record<string, string>

/** Every page route under app/pages as a path with `[param]` segments (index files are their folder). */
function discoverPages(root = resolve(process.cwd(), 'app/pages')): string[] {
  const out: string[] = []
  const walk = (dir: string, prefix: string) => {
    for (const name of readdirSync(dir).sort()) {
      const full = resolve(dir, name)
      if (statSync(full).isDirectory()) walk(full, `${prefix}/${name}`)
      else if (name.endsWith('.vue')) out.push(name === 'index.vue' ? (prefix || '/') : `${prefix}/${name.slice(0, -4)}`)
    }
  }
  walk(root, '')
  // The dev mailbox pages exist only in builds made for local mail (nuxt.config.ts).
  return out.filter(p => !p.startsWith('/dev'))
}

beforeAll(async () => {
  ({ browser, close } = await launchBrowser())
  owner = await asDemo('owner')
  const crew = (await owner.get('/api/crews')).body.find((c: { name: string }) => c.name === 'Lamplight Collective')
  const songs = (await owner.get(`/api/crews/${crew.id}/songs`)).body
  const list = Array.isArray(songs) ? songs : songs.songs
  ids = { crewId: crew.id, songId: list[0].id, token: randomUUID().replace(/-/g, '').repeat(2) }
})
afterAll(async () => close?.())

/** Collects CSP violations (the DOM event) and CSP console errors from before the first script runs. */
async function watchCsp(page: Page) {
  const found: string[] = []
  await page.exposeFunction('__reportCsp', (s: string) => found.push(s))
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) => {
      (window as unknown as { __reportCsp: (s: string) => void }).__reportCsp(`${e.violatedDirective} ${e.blockedURI} ${e.sourceFile}:${e.lineNumber}`)
    })
  })
  page.on('console', (m) => {
    if (m.type() === 'error' && /Content Security Policy/i.test(m.text())) found.push(m.text())
  })
  return found
}

const fill = (route: string) => route.replace(/\[(\w+)\]/g, (_, n: string) => ids[n] ?? randomUUID())

describe('content security policy in Chromium', () => {
  const pages = discoverPages()

  it('finds the pages', () => {
    expect(pages.length).toBeGreaterThan(10)
    expect(pages).toContain('/songs/[songId]/sheet')
  })

  for (const signedIn of [true, false]) {
    it(`every page loads with no violation (${signedIn ? 'signed in' : 'signed out'})`, async () => {
      const t = await newPage(browser)
      const violations = await watchCsp(t.page)
      if (signedIn) await signInDemo(t.page, 'owner')
      const seen: Record<string, string[]> = {}
      for (const route of [...pages, '/no-such-page']) {
        const before = violations.length
        await t.page.goto(fill(route), { waitUntil: 'load' })
        if (route !== '/no-such-page') await hydrated(t.page)
        await t.page.waitForTimeout(700) // let lazy parts (waveform, fonts, live stream) start
        if (violations.length > before) seen[route] = violations.slice(before)
      }
      await screenshot(t.page, `security-csp-last-${signedIn ? 'in' : 'out'}`)
      expect(seen).toEqual({})
      expect(t.pageErrors).toEqual([])
      expect(t.external).toEqual([])
      await t.context.close()
    }, 180_000)
  }

  it('the beat room plays the demo beat with no violation', async () => {
    const t = await newPage(browser)
    const violations = await watchCsp(t.page)
    await signInDemo(t.page, 'owner')
    await t.page.goto(`/songs/${ids.songId}/beat`)
    await hydrated(t.page)
    await t.page.getByTestId('beat-lane').waitFor()
    await t.page.getByTestId('play').click()
    await t.page.locator('[data-testid="beat-lane"][data-playing="true"]').waitFor({ timeout: 15_000 })
    await t.page.waitForTimeout(1000)
    await screenshot(t.page, 'security-beat-room')
    expect(violations).toEqual([])
    await t.context.close()
  }, 60_000)
})

describe('lyric markup is text', () => {
  it('shows <script> and <img onerror> lines as text in the sheet room, history and map, and runs nothing', async () => {
    const songId = (await owner.post(`/api/crews/${ids.crewId}/songs`, { title: 'Markup <b>song</b>' })).body.id as string
    const draftId = (await owner.post(`/api/songs/${songId}/drafts`, { name: 'Main' })).body.id as string
    const hostile = [
      { id: 'x1', bar: 1, text: '<script>window.__xss = 1</script> on the corner' },
      { id: 'x2', bar: 2, text: '<img src=x onerror="window.__xss = 2"> late bus' },
      { id: 'x3', bar: 3, text: '"><svg onload="window.__xss = 3"> rooftop' },
    ]
    const saved = await owner.post(`/api/drafts/${draftId}/versions`, { baseVersionId: null, lines: hostile, note: '<i>note</i>' })
    expect(saved.status, saved.text).toBe(201)
    // Stored as sent.
    const back = await owner.get(`/api/versions/${saved.body.id}`)
    expect(back.status).toBe(200)
    expect(JSON.stringify(back.body)).toContain('<script>window.__xss = 1</script>')

    const t = await newPage(browser)
    const violations = await watchCsp(t.page)
    const dialogs: string[] = []
    t.page.on('dialog', (d) => {
      dialogs.push(d.message())
      void d.dismiss()
    })
    await signInDemo(t.page, 'owner')
    for (const room of ['sheet', 'history', 'map', 'desk']) {
      await t.page.goto(room === 'desk' ? `/songs/${songId}` : `/songs/${songId}/${room}`)
      await hydrated(t.page)
      await t.page.getByText('late bus', { exact: false }).first().waitFor({ state: 'attached', timeout: 15_000 })
      await t.page.waitForTimeout(300)
      const body = (await t.page.locator('#__nuxt').textContent()) ?? ''
      expect(body, room).toContain('<script>window.__xss = 1</script>')
      expect(body, room).toContain('<img src=x onerror="window.__xss = 2">')
      expect(await t.page.locator('img[src="x"], svg[onload], script:not([src]):not([type="application/json"]):not([nonce])').count(), room).toBe(0)
      expect(await t.page.evaluate(() => (window as unknown as { __xss?: number }).__xss), room).toBeUndefined()
      await screenshot(t.page, `security-markup-${room}`)
    }
    expect(dialogs).toEqual([])
    expect(violations).toEqual([])
    expect(t.pageErrors).toEqual([])
    await t.context.close()
  }, 120_000)
})
