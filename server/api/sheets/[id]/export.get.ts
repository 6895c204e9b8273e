// Download a sheet as a Tiltwright tuning-sheet file.
import { idParams } from '../../../../shared/schemas/ids'
import { sheetToFile } from '../../../../shared/utils/sheets'

export default defineEventHandler(async (event): Promise<string> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams)
  const sheet = await loadVisibleSheet(user, id)
  const slug
    = sheet.title
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-|-$/g, '')
      .slice(0, 60) || 'sheet'
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  setResponseHeader(
    event,
    'content-disposition',
    `attachment; filename="tuning-sheet-${id}-${slug}.tiltsheet.json"`,
  )
  return JSON.stringify(sheetToFile(sheet), null, 2)
})
