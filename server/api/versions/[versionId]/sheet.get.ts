import { SheetCadenceQuerySchema } from '../../../../shared/schemas/cadence'
/** The final sheet of a version as data: what the sheet page, and every export, prints. */
export default defineEventHandler(async (event) => {
  const { version } = await requireVersionAccess(event, 'song.view')
  const { cadence } = validQuery(event, SheetCadenceQuerySchema)
  const model = await loadSheetModel(useDb(), version.id, { cadenceBars: cadence })
  if (!model) throw notFound('Version')
  return model
})
