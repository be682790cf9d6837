import type { Browser } from 'playwright-core'
import { launchBrowser, newPage } from './browser'

/**
 * What Chromium's MediaRecorder really writes: `ms` of its synthetic microphone (a beep),
 * recorded in a page of the test server, as bytes. Used as a real browser recording in
 * upload tests.
 */
export async function chromiumRecording(ms = 1200, existing?: Browser): Promise<{ bytes: Buffer, mimeType: string }> {
  const own = existing ? null : await launchBrowser({ fakeMedia: true })
  const browser = existing ?? own!.browser
  try {
    const { page, context } = await newPage(browser)
    await page.goto('/signin')
    const result = await page.evaluate(async (duration) => {
      const stream = await navigator.mediaDevices.getUserMedia({ audio: true })
      const recorder = new MediaRecorder(stream, { mimeType: 'audio/webm;codecs=opus' })
      const chunks: Blob[] = []
      recorder.ondataavailable = e => chunks.push(e.data)
      const done = new Promise<void>(resolve => (recorder.onstop = () => resolve()))
      recorder.start(100)
      await new Promise(resolve => setTimeout(resolve, duration))
      recorder.stop()
      await done
      stream.getTracks().forEach(t => t.stop())
      const blob = new Blob(chunks, { type: recorder.mimeType })
      const bytes = new Uint8Array(await blob.arrayBuffer())
      let binary = ''
      for (const b of bytes) binary += String.fromCharCode(b)
      return { base64: btoa(binary), mimeType: recorder.mimeType }
    }, ms)
    await context.close()
    return { bytes: Buffer.from(result.base64, 'base64'), mimeType: result.mimeType }
  }
  finally {
    await own?.close()
  }
}
