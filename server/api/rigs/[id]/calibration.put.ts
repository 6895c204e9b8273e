// The rail sensor's calibration: the readings at known positions (metres) and their fit, kept
// on the rig. A fit that does not hold answers 422 with what is wrong.
import { eq } from 'drizzle-orm'
import { idParams } from '../../../../shared/schemas/ids'
import { rigCalibrationSchema } from '../../../../shared/schemas/build'
import { fitCalibration } from '../../../../shared/utils/planner/calibration'
import type { RigView } from '../../../../shared/types/build'
import { rigs } from '../../../database/schema'

export default defineEventHandler(async (event): Promise<RigView> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, idParams, 'That rig')
  const { adcBits, pairs } = await readBodyAs(event, rigCalibrationSchema)
  const fit = fitCalibration(pairs, adcBits)
  if (!fit.ok) {
    const words = fit.issues.map(i => i.message).join(' ') || 'These readings give no fit.'
    throw invalid({ pairs: words }, 'The readings give no calibration.')
  }
  return transactionWithRetry(async (tx) => {
    const { role } = await lockRigFor(tx, user, id, 'work')
    const now = new Date()
    await tx
      .update(rigs)
      .set({ calibration: { adcBits, pairs, fit }, calibratedAt: now, lastActivityAt: now })
      .where(eq(rigs.id, id))
    return rigView(tx, id, role)
  })
})
