import fontkit from '@pdf-lib/fontkit'
import type { PDFDocument } from 'pdf-lib'
import type { Fonts } from './pdf-layout'

const FONT_FILES = {
  sans: ['fonts-inter', 'inter-latin-400-normal.woff'],
  bold: ['fonts-inter', 'inter-latin-700-normal.woff'],
  serif: ['fonts-merriweather', 'merriweather-latin-700-normal.woff'],
} as const

async function readFontAsset(base: string, file: string) {
  const raw = await useStorage(`assets:${base}`).getItemRaw(file)
  if (!raw) throw new Error(`font ${file} is missing from the server assets`)
  return new Uint8Array(raw as ArrayBuffer)
}

/** The dossier's fonts, shipped inside the build as server assets (see nuxt.config.ts). */
export async function embedDossierFonts(doc: PDFDocument): Promise<Fonts> {
  doc.registerFontkit(fontkit)
  // Subset: fontsource ships .woff, which embeds correctly only when subset.
  const embed = async ([base, file]: readonly [string, string]) =>
    doc.embedFont(await readFontAsset(base, file), { subset: true })
  return {
    sans: await embed(FONT_FILES.sans),
    bold: await embed(FONT_FILES.bold),
    serif: await embed(FONT_FILES.serif),
  }
}
