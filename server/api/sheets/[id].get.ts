import { idParams } from '../../../shared/schemas/ids'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams)
  return await loadVisibleSheet(user, id)
})
