// Security headers on every answer. The policy allows this origin only: no script, style, font or
// frame from elsewhere (fonts are shipped, nothing comes from a CDN); pages may be framed by this
// origin alone (the evidence viewer shows a PDF in a frame), never by another site. Nuxt's own
// inline boot script and Vue's style bindings need 'unsafe-inline' for scripts and styles.
const POLICY = [
  'default-src \'self\'',
  'script-src \'self\' \'unsafe-inline\'',
  'style-src \'self\' \'unsafe-inline\'',
  'img-src \'self\' data: blob:',
  'font-src \'self\'',
  'connect-src \'self\'',
  'media-src \'self\'',
  'object-src \'none\'',
  'base-uri \'self\'',
  'form-action \'self\'',
  'frame-ancestors \'self\'',
].join('; ')

export default defineEventHandler((event) => {
  if (import.meta.dev) return // Vite's dev server injects its own scripts and sockets
  setResponseHeaders(event, {
    'content-security-policy': POLICY,
    'x-content-type-options': 'nosniff',
    'x-frame-options': 'SAMEORIGIN',
    'referrer-policy': 'strict-origin-when-cross-origin',
    'permissions-policy': 'camera=(), microphone=(), geolocation=(), payment=()',
    'cross-origin-opener-policy': 'same-origin',
  })
})
