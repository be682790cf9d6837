import type { MailInput } from './mail'

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!)
}

/** A plain message with one action link, as text and as simple HTML. */
export function linkMail(to: string, subject: string, intro: string, action: string, url: string, outro: string): MailInput {
  const text = `${intro}\n\n${action}: ${url}\n\n${outro}\n\n— Barsmith`
  const html = `<div style="font-family:Georgia,serif;font-size:16px;line-height:1.6;color:#1d1a16">
<p>${escapeHtml(intro)}</p>
<p><a href="${escapeHtml(url)}" style="color:#8a5a12">${escapeHtml(action)}</a></p>
<p style="color:#5b5347;font-size:14px">${escapeHtml(outro)}</p>
<p>— Barsmith</p></div>`
  return { to, subject, text, html }
}

export function verifyMail(to: string, name: string, url: string): MailInput {
  return linkMail(to, 'Confirm your e-mail for Barsmith',
    `Hi ${name}, confirm this address to finish setting up your Barsmith account.`,
    'Confirm my e-mail', url,
    'The link works once and expires in 24 hours. If you did not sign up, ignore this message.')
}

export function resetMail(to: string, url: string): MailInput {
  return linkMail(to, 'Reset your Barsmith password',
    'Someone (hopefully you) asked to reset the password of this Barsmith account.',
    'Choose a new password', url,
    'The link works once and expires in 1 hour. If you did not ask for it, ignore this message: your password stays as it is.')
}

export function inviteMail(to: string, crewName: string, inviterName: string, roleLabel: string, url: string): MailInput {
  return linkMail(to, `${inviterName} invited you to ${crewName} on Barsmith`,
    `${inviterName} invited you to join the crew "${crewName}" on Barsmith as ${roleLabel}.`,
    'Accept the invite', url,
    'The invite works once and expires in 7 days.')
}
