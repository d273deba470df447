// On start: uploads cut off by a crash leave temporary files, and a crash between storing a file
// and writing its row can leave a stored file without a row. Both are removed.
export default defineNitroPlugin(() => {
  sweepStorage().catch(error => console.error('[trapline] storage sweep failed', error))
})
