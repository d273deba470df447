import { useCompression } from 'h3-compression'

// Answers of the API and the rendered pages travel compressed (brotli, else gzip) on a weak link: a
// 200-run event's live results shrink about tenfold. Built assets are compressed once at build time
// (`compressPublicAssets`) and served as they are; streams (live results, downloads) are left alone.
const COMPRESSIBLE = /^(application\/json|text\/html|text\/csv|text\/plain|application\/javascript)/
const MIN_BYTES = 1024

export default defineNitroPlugin((nitro) => {
  nitro.hooks.hook('beforeResponse', async (event, response) => {
    if (event.path.startsWith('/_nuxt/') || getResponseHeader(event, 'content-encoding')) return
    // An error page is rendered by an inner request (/__nuxt_error) whose body the error handler reads back as
    // text: compressed there, it reached the browser as broken bytes. Errors are small; they go as they are.
    if (getResponseStatus(event) >= 400 || event.path.startsWith('/__nuxt_error')) return
    const declared = getResponseHeader(event, 'content-type')
    const type = String(declared ?? (typeof response.body === 'object' ? 'application/json' : ''))
    if (!COMPRESSIBLE.test(type)) return
    appendResponseHeader(event, 'vary', 'accept-encoding')
    await useCompression(event, response, { minSize: MIN_BYTES })
  })
})
