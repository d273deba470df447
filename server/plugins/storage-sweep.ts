// On start: uploads cut off by a crash leave temporary files, and a crash between storing a file
// and writing its row can leave a stored file without a row. Both are removed: this server's staging at once,
// before it takes any request (so nothing received after the start is swept); stored files once the database is up.
export default defineNitroPlugin(() => {
  sweepStaging()
  sweepStorage().catch(error => console.error('[trapline] storage sweep failed', error))
})
