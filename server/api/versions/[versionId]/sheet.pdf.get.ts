import { SheetCadenceQuerySchema } from '../../../../shared/schemas/cadence'

export default defineEventHandler(async (event) => {
  const { version } = await requireVersionAccess(event, 'song.view')
  const { cadence } = validQuery(event, SheetCadenceQuerySchema)
  const model = await loadSheetModel(useDb(), version.id, { cadenceBars: cadence })
  if (!model) throw notFound('Version')
  const pdf = await renderSheetPdf(model)
  setResponseHeaders(event, {
    'Content-Type': 'application/pdf',
    'Content-Disposition': `inline; filename="${sheetFileName(model, 'pdf')}"`,
    'Content-Length': String(pdf.length),
    'Cache-Control': 'private, no-cache',
  })
  return pdf
})
