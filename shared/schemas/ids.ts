// The parameters in paths, read by paramsAs() (server/utils/errors.ts): anything that does not
// fit answers 404, never a 422 that would tell a prober what the route expects.
import { z } from 'zod'
import { CHECKLIST_STEPS } from '../utils/build'
import { ORDER_DOCUMENT_KINDS } from '../utils/states'
import { SLUG_PATTERN } from './shop'
import { plainId } from './text'

const id = plainId('No such id.')

/** `[id]` in a path: plain decimal only (`0x1`, `1e0`, `01` are no id). */
export const idParams = z.object({ id })
/** `/orders/[id]/files/[fileId]`. */
export const orderFileParams = z.object({ id, fileId: id })
/** `/orders/[id]/documents/[kind]`. */
export const orderDocumentParams = z.object({ id, kind: z.enum(ORDER_DOCUMENT_KINDS) })
/** `/products/[slug]`: the catalog's slug rule. */
export const slugParams = z.object({ slug: z.string().max(80).regex(SLUG_PATTERN) })
/** `/orders/[id]/join-codes/[codeId]/…`. */
export const joinCodeParams = z.object({ id, codeId: id })
/** `/orders/[id]/builders/[userId]/…`. */
export const builderParams = z.object({ id, userId: id })
/** `/rigs/[id]/steps/[step]`. */
export const rigStepParams = z.object({ id, step: z.enum(CHECKLIST_STEPS) })
