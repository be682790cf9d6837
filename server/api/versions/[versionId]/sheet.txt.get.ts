import { SheetCadenceQuerySchema } from '../../../../shared/schemas/cadence'
import { renderText } from '../../../../shared/utils/sheet'

export default defineEventHandler(async (event) => {
  const { version } = await requireVersionAccess(event, 'song.view')
  const { cadence } = validQuery(event, SheetCadenceQuerySchema)
  const model = await loadSheetModel(useDb(), version.id, { cadenceBars: cadence })
  if (!model) throw notFound('Version')
  setResponseHeaders(event, {
    'Content-Type': 'text/plain; charset=utf-8',
    'Content-Disposition': `attachment; filename="${sheetFileName(model, 'txt')}"`,
    'Cache-Control': 'private, no-cache',
  })
  return renderText(model)
})
