/**
 * Security headers for every response, and the content security policy of the pages.
 * Pages allow scripts only from this origin plus the per-response nonce Barsmith puts on
 * Nuxt's inline scripts (server/plugins/05.csp.ts). Styles allow 'unsafe-inline' because
 * Vue style bindings and the waveform's shadow DOM set style attributes (the minimum those
 * need). Beats and takes play from this origin or blob: URLs (wavesurfer, MediaRecorder).
 */
export const BASE_SECURITY_HEADERS: Record<string, string> = {
  'X-Content-Type-Options': 'nosniff',
  'Referrer-Policy': 'strict-origin-when-cross-origin',
  'X-Frame-Options': 'DENY',
  'Cross-Origin-Opener-Policy': 'same-origin',
  'Cross-Origin-Resource-Policy': 'same-origin',
  'Permissions-Policy': 'camera=(), geolocation=(), payment=(), usb=(), microphone=(self)',
}

/** For API responses and files: nothing may run or be framed. */
export const API_CSP = 'default-src \'none\'; frame-ancestors \'none\'; base-uri \'none\'; form-action \'none\''

export function pageCsp(nonce: string): string {
  return [
    'default-src \'self\'',
    `script-src 'self' 'nonce-${nonce}'`,
    'style-src \'self\' \'unsafe-inline\'',
    'img-src \'self\' data: blob:',
    'font-src \'self\' data:',
    'media-src \'self\' blob:',
    'connect-src \'self\'',
    'worker-src \'self\' blob:',
    'object-src \'none\'',
    'base-uri \'self\'',
    'form-action \'self\'',
    'frame-ancestors \'none\'',
  ].join('; ')
}
