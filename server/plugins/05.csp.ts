import { randomBytes } from 'node:crypto'
import { pageCsp } from '../utils/security-headers'

/**
 * Gives every rendered page a fresh nonce, puts it on each script tag Nuxt renders (its
 * inline config and payload scripts included) and sends the page policy naming that nonce.
 * Lyric text in the page is HTML-escaped by Vue (`&lt;script`), so it never matches here.
 */
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('render:html', (html, { event }) => {
    const nonce = randomBytes(16).toString('base64')
    const withNonce = (chunk: string) => chunk.replace(/<script(?=[\s>])/g, `<script nonce="${nonce}"`)
    html.head = html.head.map(withNonce)
    html.bodyPrepend = html.bodyPrepend.map(withNonce)
    html.body = html.body.map(withNonce)
    html.bodyAppend = html.bodyAppend.map(withNonce)
    setResponseHeader(event, 'Content-Security-Policy', pageCsp(nonce))
  })
  // Chromium shows an inline PDF (the sheet) through its built-in viewer, which a
  // default-src 'none' policy on the PDF response can block: keep only the framing rule there.
  nitroApp.hooks.hook('beforeResponse', (event) => {
    if (String(getResponseHeader(event, 'content-type') ?? '').startsWith('application/pdf')) {
      setResponseHeader(event, 'Content-Security-Policy', 'frame-ancestors \'none\'')
    }
  })
})
