import { renderVtt } from '../../../../shared/utils/sheet'

/** Timed lines as W3C WebVTT: one cue per performed line, timed from the song's grid. */
export default defineEventHandler(async (event) => {
  const { version } = await requireVersionAccess(event, 'song.view')
  const model = await loadSheetModel(useDb(), version.id)
  if (!model) throw notFound('Version')
  setResponseHeaders(event, {
    'Content-Type': 'text/vtt; charset=utf-8',
    'Content-Disposition': `attachment; filename="${sheetFileName(model, 'vtt')}"`,
    'Cache-Control': 'private, no-cache',
  })
  return renderVtt(model)
})
