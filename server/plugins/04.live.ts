/** Ends this instance's open event streams on shutdown (their presence rows go with them). */
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('close', () => {
    for (const end of [...openStreams]) end()
  })
})
