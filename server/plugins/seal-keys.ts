// The seal's key set is loaded at start; a server that finds none where one is expected stops here
// rather than sealing with a new key nobody knows.
export default defineNitroPlugin(() => {
  sealKeysReady().catch((e: Error) => {
    console.error(`[trapline] refusing to start: ${e.message}`)
    process.exit(1)
  })
})
