import type { PDFDocument, PDFFont, PDFPage } from 'pdf-lib'
import { rgb } from 'pdf-lib'

const A4: [number, number] = [595.28, 841.89]
const MARGIN = 50
const INK = rgb(0.05, 0.08, 0.11)
const GREY = rgb(0.35, 0.38, 0.42)

// The embedded fonts carry the Latin subset only: characters outside it are written out.
const REPLACE: Record<string, string> = {
  'Ω': 'ohm',
  '≤': '<=',
  '≥': '>=',
  '→': '->',
  '←': '<-',
  '✓': 'OK',
  '✕': 'X',
  '⚠': '!',
  'Δ': 'delta ',
  '≈': '~',
  '×': 'x',
  '÷': '/',
  'θ': 'theta',
  '·': '·',
}
/** Characters the embedded fonts cannot show: outside Latin-1, general punctuation, − and €. */
// eslint-disable-next-line no-control-regex -- the class starts at U+0000 on purpose: all of Latin-1 is kept
const UNPRINTABLE = /[^\u0000-\u00ff\u2000-\u206f\u2212\u20ac]/g
export const pdfText = (s: unknown) => String(s ?? '').replace(UNPRINTABLE, c => REPLACE[c] ?? '?')

export interface Fonts {
  sans: PDFFont
  bold: PDFFont
  serif: PDFFont
}
export interface Column {
  title: string
  width: number
  align?: 'left' | 'right'
}

/** A small flowing layout on A4: headings, wrapped text, tables that repeat their header across pages. */
export class PdfLayout {
  page!: PDFPage
  y = 0
  constructor(
    private doc: PDFDocument,
    private fonts: Fonts,
    private runningHeader: string,
  ) {
    this.newPage()
  }

  newPage() {
    this.page = this.doc.addPage(A4)
    this.y = A4[1] - MARGIN - 18
    return this
  }

  get width() {
    return A4[0] - 2 * MARGIN
  }

  ensure(height: number) {
    if (this.y - height < MARGIN + 24) this.newPage()
  }

  /** Word wrap measuring each word once; a word longer than the line (a hash) is cut by bisection. */
  private wrap(text: string, font: PDFFont, size: number, width: number): string[] {
    const measure = (t: string) => font.widthOfTextAtSize(t, size)
    const space = measure(' ')
    const lines: string[] = []
    for (const para of pdfText(text).split('\n')) {
      let line = ''
      let lineWidth = 0
      for (const word of para.split(/\s+/)) {
        let w = measure(word)
        if (line && lineWidth + space + w <= width) {
          line += ` ${word}`
          lineWidth += space + w
          continue
        }
        if (line) lines.push(line)
        line = word
        lineWidth = w
        while (lineWidth > width && line.length > 1) {
          let lo = 1
          let hi = line.length
          while (lo < hi) {
            const mid = Math.ceil((lo + hi) / 2)
            if (measure(line.slice(0, mid)) <= width) lo = mid
            else hi = mid - 1
          }
          lines.push(line.slice(0, lo))
          line = line.slice(lo)
          lineWidth = w = measure(line)
        }
      }
      lines.push(line)
    }
    return lines
  }

  heading(text: string, size = 15) {
    this.ensure(size + 30)
    this.y -= 8
    this.page.drawText(pdfText(text), { x: MARGIN, y: this.y - size, size, font: this.fonts.serif, color: INK })
    this.y -= size + 10
    return this
  }

  text(text: string, opts: { size?: number, bold?: boolean, color?: 'grey', indent?: number, gap?: number } = {}) {
    const size = opts.size ?? 9.5
    const font = opts.bold ? this.fonts.bold : this.fonts.sans
    const x = MARGIN + (opts.indent ?? 0)
    for (const line of this.wrap(text, font, size, this.width - (opts.indent ?? 0))) {
      this.ensure(size * 1.45)
      this.page.drawText(line, { x, y: this.y - size, size, font, color: opts.color === 'grey' ? GREY : INK })
      this.y -= size * 1.45
    }
    this.y -= opts.gap ?? 4
    return this
  }

  pairs(rows: [string, string][], keyWidth = 150) {
    const t = this.table(
      [
        { title: '', width: keyWidth },
        { title: '', width: this.width - keyWidth },
      ],
      rows,
      { header: false },
    )
    return t
  }

  /** A table whose rows never split; its header is repeated on every page it runs onto. */
  table(columns: Column[], rows: string[][], opts: { header?: boolean, size?: number } = {}) {
    const size = opts.size ?? 8.5
    const lineHeight = size * 1.35
    const header = opts.header !== false
    const drawHeader = () => {
      if (!header) return
      this.ensure(lineHeight * 2 + 4)
      let x = MARGIN
      for (const c of columns) {
        const w = this.fonts.bold.widthOfTextAtSize(pdfText(c.title), size)
        this.page.drawText(pdfText(c.title), {
          x: c.align === 'right' ? x + c.width - 4 - w : x,
          y: this.y - size,
          size,
          font: this.fonts.bold,
          color: INK,
        })
        x += c.width
      }
      this.y -= lineHeight + 2
      this.page.drawLine({
        start: { x: MARGIN, y: this.y + 1 },
        end: { x: MARGIN + this.width, y: this.y + 1 },
        thickness: 0.8,
        color: INK,
      })
      this.y -= 3
    }
    drawHeader()
    for (const row of rows) {
      const cells = columns.map((c, i) => this.wrap(row[i] ?? '', this.fonts.sans, size, c.width - 6))
      const height = Math.max(...cells.map(l => l.length)) * lineHeight + 3
      if (this.y - height < MARGIN + 24) {
        this.newPage()
        drawHeader()
      }
      let x = MARGIN
      cells.forEach((lines, i) => {
        const c = columns[i]!
        lines.forEach((line, j) => {
          const w = this.fonts.sans.widthOfTextAtSize(line, size)
          this.page.drawText(line, {
            x: c.align === 'right' ? x + c.width - 4 - w : x,
            y: this.y - size - j * lineHeight,
            size,
            font: this.fonts.sans,
            color: INK,
          })
        })
        x += c.width
      })
      this.y -= height
      this.page.drawLine({
        start: { x: MARGIN, y: this.y + 1.5 },
        end: { x: MARGIN + this.width, y: this.y + 1.5 },
        thickness: 0.25,
        color: GREY,
      })
    }
    this.y -= 8
    return this
  }

  /** Running header and "page n of N" on every page, once the document is complete. */
  finish() {
    const pages = this.doc.getPages()
    pages.forEach((p, i) => {
      const header = pdfText(this.runningHeader)
      p.drawText(header, { x: MARGIN, y: A4[1] - MARGIN + 8, size: 7.5, font: this.fonts.sans, color: GREY })
      p.drawLine({
        start: { x: MARGIN, y: A4[1] - MARGIN + 2 },
        end: { x: A4[0] - MARGIN, y: A4[1] - MARGIN + 2 },
        thickness: 0.4,
        color: GREY,
      })
      const footer = `Page ${i + 1} of ${pages.length}`
      p.drawText(footer, {
        x: A4[0] - MARGIN - this.fonts.sans.widthOfTextAtSize(footer, 7.5),
        y: MARGIN - 20,
        size: 7.5,
        font: this.fonts.sans,
        color: GREY,
      })
      p.drawText('Trapline records and computes; it does not certify safety.', {
        x: MARGIN,
        y: MARGIN - 20,
        size: 7.5,
        font: this.fonts.sans,
        color: GREY,
      })
    })
  }
}

/** How a signature in the file was made, in words: a passkey, or the password again (the weaker kind). */
export const signedWith = (method: string | undefined) =>
  method === 'passkey'
    ? 'with a passkey'
    : method === 'in-person' ? 'in person on the organiser\'s device' : 'password re-entered, the weaker kind'
