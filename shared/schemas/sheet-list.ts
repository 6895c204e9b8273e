import { listQuerySchema } from './list'

export const sheetListQuery = listQuerySchema(['createdAt', 'title'] as const, 'createdAt', 'desc')
