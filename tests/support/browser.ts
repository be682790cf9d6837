import { mkdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core'
import { inject } from 'vitest'
import { DEMO_EMAILS, DEMO_PASSWORD } from './http'

/**
 * Debian's Chromium, started with no network side-channels. Playwright gives every launch
 * a fresh temporary profile (user data dir) of its own. `fakeMedia` gives it a synthetic
 * microphone that needs no permission prompt.
 */
export async function launchBrowser(options: { fakeMedia?: boolean } = {}): Promise<{ browser: Browser, close: () => Promise<void> }> {
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: [
      '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
      '--disable-background-networking', '--disable-component-update', '--disable-sync',
      '--autoplay-policy=no-user-gesture-required',
      // A synthetic microphone (a beep) that needs no permission prompt, for recording tests.
      ...(options.fakeMedia ? ['--use-fake-device-for-media-stream', '--use-fake-ui-for-media-stream'] : []),
    ],
  })
  return {
    browser,
    close: () => browser.close(),
  }
}

export interface TestPage {
  context: BrowserContext
  page: Page
  /** Requests the page tried to send anywhere but the test server (blocked; should stay empty). */
  external: string[]
  /** Uncaught errors in the page. */
  pageErrors: string[]
}

export async function newPage(browser: Browser, options: { width?: number, height?: number } = {}): Promise<TestPage> {
  const context = await browser.newContext({
    baseURL: inject('baseUrl'),
    viewport: { width: options.width ?? 1280, height: options.height ?? 860 },
  })
  const external: string[] = []
  const pageErrors: string[] = []
  await context.route('**/*', (route) => {
    const url = new URL(route.request().url())
    if (['127.0.0.1', 'localhost'].includes(url.hostname) || ['data:', 'blob:'].includes(url.protocol)) return route.continue()
    external.push(url.toString())
    return route.abort()
  })
  const page = await context.newPage()
  page.on('pageerror', e => pageErrors.push(e.message))
  return { context, page, external, pageErrors }
}

export async function signInAs(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto('/signin')
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(url => !url.pathname.startsWith('/signin'))
}

export const signInDemo = (page: Page, role: keyof typeof DEMO_EMAILS) => signInAs(page, DEMO_EMAILS[role])

export const ARTIFACTS = resolve(process.cwd(), 'test-results')

/** Saves a screenshot under test-results/ (kept as an artifact, never compared). */
export async function screenshot(page: Page, name: string) {
  mkdirSync(ARTIFACTS, { recursive: true })
  await page.screenshot({ path: resolve(ARTIFACTS, `${name}.png`), fullPage: true })
}

/** Waits until Vue has mounted the page, so clicks on server-rendered buttons reach their handlers. */
export async function hydrated(page: Page) {
  await page.waitForFunction(() => !!(document.querySelector('#__nuxt') as { __vue_app__?: unknown } | null)?.__vue_app__)
}
