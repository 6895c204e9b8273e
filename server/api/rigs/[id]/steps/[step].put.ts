// Tick or untick a checklist step, with a short note. Ticking records who and when; unticking
// clears both and keeps the note. The rig's row is locked first, so two builders ticking at once
// queue rather than race on the step's row.
import { rigStepParams } from '../../../../../shared/schemas/ids'
import { updateStepSchema } from '../../../../../shared/schemas/build'
import type { RigView } from '../../../../../shared/types/build'
import { rigSteps } from '../../../../database/schema'

export default defineEventHandler(async (event): Promise<RigView> => {
  const user = await requireUser(event)
  const { id, step } = paramsAs(event, rigStepParams, 'That rig')
  const input = await readBodyAs(event, updateStepSchema)
  return transactionWithRetry(async (tx) => {
    const { role } = await lockRigFor(tx, user, id, 'work')
    const now = new Date()
    const [had] = (await stepsOf(tx, [id])).filter(s => s.step === step)
    const done = input.done
      ? { doneAt: had?.doneAt ?? now, doneById: had?.doneAt ? had.doneById : user.id }
      : { doneAt: null, doneById: null }
    const note = input.note !== undefined ? { note: input.note } : {}
    await tx
      .insert(rigSteps)
      .values({ rigId: id, step, ...done, note: input.note ?? null, updatedById: user.id })
      .onDuplicateKeyUpdate({ set: { ...done, ...note, updatedById: user.id, updatedAt: now } })
    await touchRig(tx, id, now)
    return rigView(tx, id, role)
  })
})
