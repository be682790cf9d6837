/**
 * A page rendered while the database is away shows the outage message where its data would
 * be; this gives the page the same status as the API (503 with Retry-After), so a proxy, a
 * monitor or a crawler sees an outage rather than a good page.
 */
export default defineNuxtPlugin((nuxtApp) => {
  nuxtApp.hook('app:rendered', () => {
    const event = nuxtApp.ssrContext?.event
    if (!event) return
    const errors = Object.values(nuxtApp.payload._errors ?? {}) as Array<{ statusCode?: number } | null | undefined>
    if (errors.some(e => e?.statusCode === 503)) {
      setResponseStatus(event, 503)
      event.node.res.setHeader('Retry-After', '5')
    }
  })
})
