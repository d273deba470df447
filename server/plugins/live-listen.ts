// The connection that listens for new live versions closes with the server.
export default defineNitroPlugin((nitro) => {
  nitro.hooks.hook('close', () => stopListening(true))
})
