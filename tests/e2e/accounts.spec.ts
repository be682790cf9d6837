import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launchBrowser, newPage, screenshot, signInDemo } from '../support/browser'
import { DEMO_EMAILS } from '../support/http'
import { waitForMail, linkIn } from '../support/mail'

let browser: Browser
let close: () => Promise<void>
beforeAll(async () => ({ browser, close } = await launchBrowser()))
afterAll(async () => close?.())

describe('accounts in Chromium', () => {
  for (const role of Object.keys(DEMO_EMAILS) as Array<keyof typeof DEMO_EMAILS>) {
    it(`the demo ${role} signs in and sees the demo crew and song`, async () => {
      const { page, context, external, pageErrors } = await newPage(browser)
      await signInDemo(page, role)
      await page.getByTestId('crew-list').getByText('Lamplight Collective').click()
      await page.getByTestId('song-list').getByText('Night Bus Home').waitFor()
      await expect(page.getByTestId('member-list').getByText(DEMO_EMAILS[role], { exact: true }).count()).resolves.toBe(1)
      if (role === 'owner') await screenshot(page, 'crew-owner-laptop')
      expect(external).toEqual([])
      expect(pageErrors).toEqual([])
      await context.close()
    })
  }

  it('shows the server\'s field messages beside the sign-up fields', async () => {
    const { page, context } = await newPage(browser, { width: 390, height: 844 })
    await page.goto('/signup')
    await page.getByLabel('Your name').fill('Someone')
    await page.getByLabel('E-mail').fill('not-an-address')
    await page.getByLabel('Password').fill('short')
    await page.getByRole('button', { name: 'Create account' }).click()
    await page.getByText('Enter a valid e-mail address').waitFor()
    await page.getByText('Use at least 10 characters.').waitFor()
    await screenshot(page, 'signup-errors-phone')
    await context.close()
  })

  it('invite → accept by signing up → the new member sees the crew', async () => {
    const invitee = `newcomer-${randomUUID().slice(0, 8)}@example.test`
    const owner = await newPage(browser)
    await signInDemo(owner.page, 'owner')
    await owner.page.getByText('Lamplight Collective').click()
    await owner.page.locator('#field-invite-email').fill(invitee)
    await owner.page.locator('#field-invite-role').selectOption('cowriter')
    await owner.page.getByRole('button', { name: 'Send invite' }).click()
    await owner.page.getByText(`Invite sent to ${invitee}.`).waitFor()
    await owner.page.getByTestId('invite-list').getByText(invitee).waitFor()

    const mail = await waitForMail(invitee, m => /invited you/.test(m.subject))
    const link = linkIn(mail, '/invites/')

    const guest = await newPage(browser, { width: 390, height: 844 })
    await guest.page.goto(link)
    await guest.page.getByText('Lamplight Collective').first().waitFor()
    await guest.page.getByRole('link', { name: 'New here? Create an account' }).click()
    await guest.page.getByLabel('Your name').fill('Rowan Newcomer')
    await expect(guest.page.getByLabel('E-mail').inputValue()).resolves.toBe(invitee)
    await guest.page.getByLabel('Password').fill('newcomer-pass-phrase')
    await guest.page.getByRole('button', { name: 'Create account' }).click()
    await guest.page.getByRole('heading', { name: 'Lamplight Collective' }).waitFor()
    await guest.page.getByTestId('member-list').getByText(invitee).waitFor()
    await guest.page.getByTestId('song-list').getByText('Night Bus Home').waitFor()
    await screenshot(guest.page, 'crew-new-member-phone')
    expect(guest.external).toEqual([])
    await owner.context.close()
    await guest.context.close()
  })
})
