import { and, asc, desc, eq, isNull } from 'drizzle-orm'
import PDFDocument from 'pdfkit'
import { crews, drafts, memberships, sealLifts, seals, songs, users, versions } from '../database/schema'
import type { StoredCadence } from '../../shared/schemas/cadence'
import { autoPlace, cadenceRow, DEFAULT_SUBDIVISION, type CadenceSyllable } from '../../shared/utils/cadence'
import { formatMinutes, type Grid } from '../../shared/utils/grid'
import { formatShare, SPLIT_CAUTION, totalBp } from '../../shared/utils/shares'
import { creditLine, gridLine, sheetSections, versionLabel, type SheetModel, type SheetSection } from '../../shared/utils/sheet'
import { analyseDraft } from './prosody/analyse'
import type { DbOrTx } from './db'

/** The seal of `versionId` that was not lifted, if any. */
export async function activeSealOfVersion(db: DbOrTx, versionId: string) {
  const [row] = await db.select({ seal: seals }).from(seals)
    .leftJoin(sealLifts, eq(sealLifts.sealId, seals.id))
    .where(and(eq(seals.versionId, versionId), isNull(sealLifts.id)))
    .orderBy(desc(seals.sealedAt)).limit(1)
  return row?.seal ?? null
}

/** The song's seal that was not lifted (a song has at most one), if any. */
export async function activeSealOfSong(db: DbOrTx, songId: string) {
  const [row] = await db.select({ seal: seals, versionNumber: versions.number, draftId: versions.draftId, draftName: drafts.name }).from(seals)
    .innerJoin(versions, eq(versions.id, seals.versionId))
    .innerJoin(drafts, eq(drafts.id, versions.draftId))
    .leftJoin(sealLifts, eq(sealLifts.sealId, seals.id))
    .where(and(eq(seals.songId, songId), isNull(sealLifts.id)))
    .orderBy(desc(seals.sealedAt)).limit(1)
  return row ?? null
}

/**
 * Everything the final sheet of `versionId` prints: performed lines by section with bar
 * times, credits, and the split sheet (the one kept in the seal when sealed, else the
 * song's working sheet). Null when the version does not exist.
 */
export async function loadSheetModel(db: DbOrTx, versionId: string, options: { cadenceBars?: { from: number, to: number } } = {}): Promise<SheetModel | null> {
  const [row] = await db.select({ version: versions, draft: drafts, song: songs, crewName: crews.name }).from(versions)
    .innerJoin(drafts, eq(drafts.id, versions.draftId))
    .innerJoin(songs, eq(songs.id, drafts.songId))
    .innerJoin(crews, eq(crews.id, songs.crewId))
    .where(eq(versions.id, versionId))
  if (!row) return null
  const { version, draft, song } = row
  const grid = { bpm: song.bpm, beatsPerBar: song.beatsPerBar, offsetMs: song.offsetMs, feel: song.feel }
  const seal = await activeSealOfVersion(db, version.id)
  const { sections, omitted } = sheetSections(version.doc, version.lines, grid)
  if (options.cadenceBars) await addCadenceRows(sections, version.cadence, grid, song.crewId, options.cadenceBars)

  const splitRows = seal
    ? seal.split.map(s => ({ name: s.name, role: s.role, shareBp: s.shareBp, member: !!s.userId, confirmed: !!s.confirmedAt }))
    : (await loadSplitLines(db, song.id)).map(s => ({ name: s.name, role: s.role, shareBp: s.shareBp, member: !!s.userId, confirmed: !!s.confirmedAt }))
  const producers = await db.select({ name: users.name }).from(memberships).innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.crewId, song.crewId), eq(memberships.role, 'producer'))).orderBy(asc(users.name))

  return {
    songId: song.id,
    title: song.title,
    crewName: row.crewName,
    version: { id: version.id, number: version.number, draftId: draft.id, draftName: draft.name, createdAt: version.createdAt.toISOString() },
    grid,
    seal: seal ? { id: seal.id, sealedAt: seal.sealedAt.toISOString(), signers: seal.signers.map(s => ({ name: s.name, role: s.role })) } : null,
    credits: { writers: splitRows.map(s => s.name), producers: producers.map(p => p.name) },
    sections,
    omitted,
    split: splitRows.length ? { lines: splitRows, totalBp: totalBp(splitRows) } : null,
    caution: SPLIT_CAUTION,
  }
}

/**
 * Puts the compact cadence row (`cadenceRow`) under each performed line of the chosen bars:
 * the stored placement when it still matches the line's syllables, else the automatic one.
 */
async function addCadenceRows(sections: SheetSection[], stored: StoredCadence, grid: Grid, crewId: string, bars: { from: number, to: number }) {
  const chosen = sections.flatMap(s => s.lines).filter(l => l.bar + l.bars - 1 >= bars.from && l.bar <= bars.to)
  if (!chosen.length) return
  const analysis = analyseDraft({ lines: chosen.map(l => ({ id: l.id, bar: l.bar, text: l.text })) }, await loadLexicon(crewId))
  const byId = new Map(analysis.lines.map(l => [l.id, l]))
  for (const line of chosen) {
    const syllables: CadenceSyllable[] = (byId.get(line.id)?.words ?? []).filter(w => !w.isAdlib)
      .flatMap(w => w.syllableParts.map(p => ({ text: '', stress: p.stress })))
    const frame = { sub: stored[line.id]?.sub ?? DEFAULT_SUBDIVISION, beatsPerBar: grid.beatsPerBar, bars: line.bars }
    const kept = stored[line.id]
    const placement = kept && kept.slots.length === syllables.length ? kept : { sub: frame.sub, slots: autoPlace(syllables, frame) }
    line.cadence = cadenceRow(syllables, placement, { ...frame, sub: placement.sub })
  }
}

/** A file name for an export: the title in plain letters, the version number, the extension. */
export function sheetFileName(model: SheetModel, ext: string): string {
  const base = model.title.normalize('NFKD').replace(/[^\w\s-]/g, '').trim().replace(/\s+/g, '-').toLowerCase().slice(0, 60) || 'sheet'
  return `${base}-v${model.version.number}${model.seal ? '-sealed' : ''}.${ext}`
}

const FONT_FILES = {
  regular: 'literata-latin-400-normal.woff',
  italic: 'literata-latin-400-italic.woff',
  semibold: 'literata-latin-600-normal.woff',
  semiboldItalic: 'literata-latin-600-italic.woff',
} as const

let fontCache: Promise<Record<keyof typeof FONT_FILES, Buffer>> | undefined

/** Literata as shipped by @fontsource (bundled as server assets `fonts:`), read once. */
function sheetFonts() {
  fontCache ??= (async () => {
    const storage = useStorage('assets:fonts')
    const entries = await Promise.all(Object.entries(FONT_FILES).map(async ([key, file]) => {
      const raw = await storage.getItemRaw(file)
      if (!raw) throw new Error(`font ${file} is missing from the server assets`)
      return [key, Buffer.from(raw as ArrayBuffer)] as const
    }))
    return Object.fromEntries(entries) as Record<keyof typeof FONT_FILES, Buffer>
  })().catch((error) => {
    fontCache = undefined
    throw error
  })
  return fontCache
}

const INK = '#1d1a16'
const SOFT = '#5b5347'
const FAINT = '#968b78'
const RULE = '#d6c6aa'

/**
 * The final sheet as a PDF (A4, Literata embedded): header with credits, grid and version,
 * sections with bar numbers and times in the margin, ad-libs in italic grey, then the split
 * sheet with its caution. Lines marked out are not in the model, so not in the file.
 */
export async function renderSheetPdf(model: SheetModel): Promise<Buffer> {
  const fonts = await sheetFonts()
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: 56, bottom: 64, left: 56, right: 56 },
    font: null as unknown as string,
    bufferPages: true,
    info: { Title: `${model.title} — ${versionLabel(model)}`, Author: model.crewName, Subject: 'Final lyric sheet', Creator: 'Barsmith' },
  })
  doc.registerFont('L', fonts.regular)
  doc.registerFont('LI', fonts.italic)
  doc.registerFont('LB', fonts.semibold)
  doc.registerFont('LBI', fonts.semiboldItalic)
  const chunks: Buffer[] = []
  doc.on('data', (c: Buffer) => chunks.push(c))
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })

  const left = doc.page.margins.left
  const width = doc.page.width - left - doc.page.margins.right
  const textX = left + 78
  const textWidth = width - 78
  const bottom = () => doc.page.height - doc.page.margins.bottom
  const ensure = (h: number) => {
    if (doc.y + h > bottom()) doc.addPage()
  }

  doc.font('LB').fontSize(24).fillColor(INK).text(model.title, left, doc.y, { width })
  doc.moveDown(0.2)
  doc.font('L').fontSize(10.5).fillColor(SOFT).text(`${model.crewName} · ${model.version.draftName} · ${versionLabel(model)}`, { width })
  const credits = creditLine(model)
  if (credits) doc.text(credits, { width })
  doc.fillColor(FAINT).fontSize(9.5).text(gridLine(model.grid), { width })
  if (model.seal) {
    doc.moveDown(0.4)
    doc.font('LBI').fontSize(10.5).fillColor(INK).text(`Sealed final sheet — signed off by ${model.seal.signers.map(s => s.name).join(', ')}`, { width })
  }
  doc.moveDown(0.6)
  doc.moveTo(left, doc.y).lineTo(left + width, doc.y).lineWidth(0.5).strokeColor(RULE).stroke()
  doc.moveDown(0.8)

  for (const section of model.sections) {
    ensure(48)
    if (section.heading) {
      doc.font('LB').fontSize(9).fillColor(SOFT).text(section.heading.toUpperCase(), textX, doc.y, { width: textWidth, characterSpacing: 1.2 })
      doc.moveDown(0.35)
    }
    for (const line of section.lines) {
      doc.font('L').fontSize(12.5)
      // widthOfString is far cheaper than laying the text out twice; lines wrap rarely.
      ensure(Math.ceil(doc.widthOfString(line.text) / textWidth) * doc.currentLineHeight(true) + 6)
      const y = doc.y
      doc.font('L').fontSize(8.5).fillColor(FAINT)
        .text(String(line.bar), left, y + 3, { width: 26, align: 'right', lineBreak: false })
        .text(formatMinutes(line.startMs), left + 32, y + 3, { width: 38, lineBreak: false })
      doc.x = textX
      doc.y = y
      line.segments.forEach((seg, i) => {
        doc.font(seg.adlib ? 'LI' : 'L').fontSize(12.5).fillColor(seg.adlib ? SOFT : INK)
        if (i === 0) doc.text(seg.text, textX, y, { width: textWidth, continued: i < line.segments.length - 1, lineGap: 2 })
        else doc.text(seg.text, { continued: i < line.segments.length - 1, lineGap: 2 })
      })
      doc.x = left
      if (line.cadence) {
        ensure(14)
        // Literata is the only face bundled; spacing keeps the slots apart.
        doc.font('L').fontSize(8).fillColor(SOFT).text(line.cadence, textX, doc.y + 1, { width: textWidth, lineBreak: false, characterSpacing: 1.6 })
        doc.x = left
      }
      doc.moveDown(0.15)
    }
    doc.moveDown(0.7)
  }

  if (model.split?.lines.length) {
    ensure(120)
    doc.moveDown(0.4)
    doc.font('LB').fontSize(13).fillColor(INK).text('Split sheet', left, doc.y, { width })
    doc.moveDown(0.3)
    for (const s of model.split.lines) {
      ensure(18)
      const y = doc.y
      doc.font('L').fontSize(11).fillColor(INK).text(s.name, left, y, { width: width * 0.45, lineBreak: false })
      doc.fillColor(SOFT).text(s.role ?? '', left + width * 0.45, y, { width: width * 0.25, lineBreak: false })
      doc.fillColor(INK).text(`${formatShare(s.shareBp)} %`, left + width * 0.7, y, { width: width * 0.14, align: 'right', lineBreak: false })
      doc.fillColor(FAINT).fontSize(9).text(s.member ? (s.confirmed ? 'confirmed' : 'to confirm') : 'outside', left + width * 0.87, y + 1.5, { width: width * 0.13, align: 'right', lineBreak: false })
      doc.x = left
      doc.y = y + 17
    }
    doc.moveTo(left, doc.y).lineTo(left + width, doc.y).lineWidth(0.5).strokeColor(RULE).stroke()
    doc.moveDown(0.3)
    doc.font('LB').fontSize(11).fillColor(INK).text(`Total ${formatShare(model.split.totalBp)} %`, left, doc.y, { width: width * 0.84, align: 'right' })
    doc.moveDown(0.6)
    doc.font('LI').fontSize(9).fillColor(SOFT).text(model.caution, left, doc.y, { width })
  }

  const range = doc.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i)
    const y = doc.page.height - 40
    // The bottom margin would push footer text to a new page; lift it while writing there.
    const margin = doc.page.margins.bottom
    doc.page.margins.bottom = 0
    doc.font('L').fontSize(8).fillColor(FAINT)
      .text(`${model.title} — ${versionLabel(model)} · page ${i + 1} of ${range.count}`, left, y, { width, align: 'center', lineBreak: false })
    doc.page.margins.bottom = margin
  }
  doc.end()
  return done
}
