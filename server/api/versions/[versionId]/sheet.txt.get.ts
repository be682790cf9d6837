import { renderText } from '../../../../shared/utils/sheet'

export default defineEventHandler(async (event) => {
  const { version } = await requireVersionAccess(event, 'song.view')
  const model = await loadSheetModel(useDb(), version.id)
  if (!model) throw notFound('Version')
  setResponseHeaders(event, {
    'Content-Type': 'text/plain; charset=utf-8',
    'Content-Disposition': `attachment; filename="${sheetFileName(model, 'txt')}"`,
    'Cache-Control': 'private, no-cache',
  })
  return renderText(model)
})
