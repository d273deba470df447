import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { join, relative } from 'node:path'
import { createHash } from 'node:crypto'
import { defineNuxtModule } from '@nuxt/kit'

// The interface fonts in two parts per face: a small one with the characters nearly every page uses (ASCII
// and the figures' punctuation), made from the @fontsource file by subset-font (HarfBuzz's hb-subset, the
// usual subsetter), and the whole Latin file, which the browser downloads only for a page that shows a
// character of it beyond the small one (an accented name). On a weak link the fonts are most of a first visit.
const FACES = [
  { family: 'Inter', pkg: 'inter', weight: 400 },
  { family: 'Inter', pkg: 'inter', weight: 700 },
  { family: 'Merriweather', pkg: 'merriweather', weight: 400 },
  { family: 'Merriweather', pkg: 'merriweather', weight: 700 },
]
/** What the small face holds: ASCII, no-break space, °, ±, ·, ×, dashes, quotes, ellipsis, minus. */
const BASIC_RANGE = 'U+0020-007E,U+00A0,U+00B0,U+00B1,U+00B7,U+00D7,U+2013-2014,U+2019,U+201C-201D,U+2026,U+2212'
const BASIC_EXTRA = '\u00a0°±·×–—’“”…−'
/** Fontsource's own range of its Latin file. */
const LATIN_RANGE = 'U+0000-00FF,U+0131,U+0152-0153,U+02BB-02BC,U+02C6,U+02DA,U+02DC,U+0304,U+0308,U+0329,'
  + 'U+2000-206F,U+20AC,U+2122,U+2191,U+2193,U+2212,U+2215,U+FEFF,U+FFFD'

function basicText() {
  let text = BASIC_EXTRA
  for (let c = 0x20; c <= 0x7e; c++) text += String.fromCodePoint(c)
  return text
}

export default defineNuxtModule({
  meta: { name: 'trapline-font-subsets' },
  async setup(_options, nuxt) {
    const { default: subsetFont } = await import('subset-font')
    // Beside the build, not in it: the build folder is emptied as a build starts.
    const dir = join(nuxt.options.rootDir, 'node_modules', '.cache', 'trapline-fonts')
    mkdirSync(dir, { recursive: true })
    const rules: string[] = []
    // A new character list makes new files (the names carry its hash), never a stale cached subset.
    const version = createHash('sha256').update(basicText()).digest('hex').slice(0, 8)
    for (const f of FACES) {
      const file = join(nuxt.options.rootDir, 'node_modules', '@fontsource', f.pkg, 'files', `${f.pkg}-latin-${f.weight}-normal.woff2`)
      const small = `${f.pkg}-${f.weight}-basic-${version}.woff2`
      if (!existsSync(join(dir, small))) {
        writeFileSync(join(dir, small), await subsetFont(readFileSync(file), basicText(), { targetFormat: 'woff2' }))
      }
      const face = (src: string, range: string) => `@font-face{font-family:'${f.family}';font-style:normal;`
        + `font-display:swap;font-weight:${f.weight};src:url('${src}') format('woff2');unicode-range:${range}}`
      // Overlapping ranges: the face defined last is tried first, so the small one comes second.
      rules.push(face(relative(dir, file), LATIN_RANGE), face(`./${small}`, BASIC_RANGE))
    }
    const css = join(dir, 'fonts.css')
    writeFileSync(css, `${rules.join('\n')}\n`)
    nuxt.options.css.unshift(css)
  },
})
