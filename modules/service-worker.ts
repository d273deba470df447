import { join } from 'node:path'
import { defineNuxtModule } from '@nuxt/kit'
import { generateSW } from 'workbox-build'

/**
 * The service worker, made by Workbox after each production build: the built assets are precached, and the
 * run sheet's page and data (and the home page) are answered from the network first, from the copy last seen
 * when there is no link, so a run sheet once opened keeps working offline (its writes wait in IndexedDB).
 */
export default defineNuxtModule({
  meta: { name: 'trapline-service-worker' },
  setup(_options, nuxt) {
    if (nuxt.options.dev) return
    // After the public assets are copied and before the server is built: the server lists the files it serves.
    nuxt.hook('nitro:build:public-assets', async (nitro) => {
      const dir = nitro.options.output.publicDir
      const { count, size, warnings } = await generateSW({
        globDirectory: dir,
        globPatterns: ['_nuxt/**/*.{js,css,woff2}', 'favicon.svg', 'manifest.webmanifest'],
        swDest: join(dir, 'sw.js'),
        mode: 'production',
        inlineWorkboxRuntime: true,
        clientsClaim: true,
        skipWaiting: true,
        cleanupOutdatedCaches: true,
        // Hashed names: the URL is the version, no revision needed.
        dontCacheBustURLsMatching: /^_nuxt\//,
        runtimeCaching: [
          {
            urlPattern: ({ request, url }) => /^\/(events\/\d+\/run-sheet|home)$/.test(url.pathname)
              && (request.mode === 'navigate' || !!request.headers.get('accept')?.includes('text/html')),
            handler: 'NetworkFirst',
            options: { cacheName: 'trapline-pages', networkTimeoutSeconds: 5 },
          },
          {
            urlPattern: ({ url }) => /^\/api\/(events\/\d+\/run-sheet|me|clock)$/.test(url.pathname),
            handler: 'NetworkFirst',
            options: { cacheName: 'trapline-data', networkTimeoutSeconds: 5 },
          },
        ],
      })
      for (const w of warnings) console.warn(`[service worker] ${w}`)
      console.info(`[service worker] ${count} files precached (${(size / 1024).toFixed(0)} KiB before compression)`)
    })
  },
})
