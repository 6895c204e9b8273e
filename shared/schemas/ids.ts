import { z } from 'zod'
import { plainId } from './text'

/** `[id]` in a path: plain decimal only (`0x1`, `1e0`, `01` are no id). */
export const idParams = z.object({ id: plainId('No such id.') })
