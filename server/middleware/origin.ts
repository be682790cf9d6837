/**
 * Refuses state-changing API requests made by a page of another origin (CSRF). Browsers
 * send Origin (or Sec-Fetch-Site) on such requests; clients that send neither (curl,
 * server-to-server) are not browsers and carry no ambient cookie risk of this kind.
 */
export default defineEventHandler((event) => {
  if (!event.path.startsWith('/api/')) return
  if (['GET', 'HEAD', 'OPTIONS'].includes(event.method)) return
  const origin = getRequestHeader(event, 'origin')
  const fetchSite = getRequestHeader(event, 'sec-fetch-site')
  if (origin && origin !== 'null') {
    const host = getRequestHeader(event, 'x-forwarded-host') && process.env.TRUST_PROXY === '1'
      ? getRequestHeader(event, 'x-forwarded-host')
      : getRequestHeader(event, 'host')
    let originHost: string
    try {
      originHost = new URL(origin).host
    }
    catch {
      originHost = ''
    }
    if (originHost === host) return
  }
  else if (!fetchSite || fetchSite === 'same-origin' || fetchSite === 'none') {
    return
  }
  throw createError({ statusCode: 403, message: 'This request came from another site and was refused. Use Barsmith from its own address.' })
})
