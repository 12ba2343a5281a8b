import { createRequire } from 'node:module'
import path from 'node:path'
import pdfmake from 'pdfmake'
import type { Content, TDocumentDefinitions } from 'pdfmake/interfaces'
import { SCREENING_CAUTION } from '../../shared/ui/cautions'

/**
 * pdfmake 0.3 on the server: one singleton, set up once with the full Atkinson Hyperlegible TTFs (the web
 * font subsets lack many Latin letters), no URL access at all and local access only to the font folder.
 */
const require = createRequire(import.meta.url)
const FONT_DIR = path.dirname(require.resolve('@expo-google-fonts/atkinson-hyperlegible/package.json'))

let ready = false
function setup() {
  if (ready) return
  pdfmake.setFonts({
    Atkinson: {
      normal: path.join(FONT_DIR, '400Regular/AtkinsonHyperlegible_400Regular.ttf'),
      bold: path.join(FONT_DIR, '700Bold/AtkinsonHyperlegible_700Bold.ttf'),
      italics: path.join(FONT_DIR, '400Regular_Italic/AtkinsonHyperlegible_400Regular_Italic.ttf'),
      bolditalics: path.join(FONT_DIR, '700Bold_Italic/AtkinsonHyperlegible_700Bold_Italic.ttf'),
    },
  })
  const pm = pdfmake as unknown as { setUrlAccessPolicy(f: (url: string) => boolean): void; setLocalAccessPolicy(f: (p: string) => boolean): void }
  pm.setUrlAccessPolicy(() => false)
  pm.setLocalAccessPolicy((p) => path.resolve(p).startsWith(FONT_DIR))
  ready = true
}

export const BRAND = { ink: '#1b2a3a', navy: '#14375e', caution: '#8a5a00', cautionBg: '#fff6df', muted: '#5b6b7b' }

/** The caution box used at the top of every report. */
export function cautionBox(extra: string[] = []): Content {
  return {
    table: {
      widths: ['*'],
      body: [[{
        stack: [
          { text: SCREENING_CAUTION.heading, bold: true, color: BRAND.caution, margin: [0, 0, 0, 3] },
          { ul: [...SCREENING_CAUTION.points, ...extra], fontSize: 8.5 },
          { text: SCREENING_CAUTION.emergency, bold: true, fontSize: 8.5, margin: [0, 3, 0, 0] },
        ],
        fillColor: BRAND.cautionBg,
      }]],
    },
    layout: { hLineColor: () => '#c98a00', vLineColor: () => '#c98a00' },
    margin: [0, 0, 0, 10],
  }
}

/** A PDF with the caution in every page footer and page numbers. */
export async function renderPdf(dd: Omit<TDocumentDefinitions, 'footer' | 'defaultStyle'> & { footerLabel: string }): Promise<Buffer> {
  setup()
  const { footerLabel, ...rest } = dd
  const def: TDocumentDefinitions = {
    pageSize: 'A4',
    pageMargins: [40, 48, 40, 70],
    ...rest,
    defaultStyle: { font: 'Atkinson', fontSize: 9.5, color: BRAND.ink, lineHeight: 1.15 },
    footer: (page: number, pages: number) => ({
      margin: [40, 6, 40, 0],
      stack: [
        { canvas: [{ type: 'line', x1: 0, y1: 0, x2: 515, y2: 0, lineWidth: 0.8, lineColor: '#c98a00' }] },
        { text: `Caution: ${SCREENING_CAUTION.summary} ${SCREENING_CAUTION.emergency}`, fontSize: 7, color: BRAND.caution, margin: [0, 3, 0, 2] },
        { columns: [{ text: footerLabel, fontSize: 7, color: BRAND.muted }, { text: `Page ${page} of ${pages}`, alignment: 'right', fontSize: 7, color: BRAND.muted, width: 70 }] },
      ],
    }),
  }
  return pdfmake.createPdf(def).getBuffer()
}
