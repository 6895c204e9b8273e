// Every state-changing call from a page goes through here: it carries the CSRF token
// (nuxt-csurf) and turns the server's error envelope into { message, fields }.
import type { FieldErrors } from '~~/shared/utils/field-errors'

export interface ApiFailure {
  status: number
  message: string
  code?: string
  fields: FieldErrors
}

export function toApiFailure(e: unknown): ApiFailure {
  const err = e as {
    statusCode?: number
    status?: number
    data?: { message?: string, data?: { code?: string, fields?: FieldErrors } }
  }
  const status = err.statusCode ?? err.status ?? 0
  const body = err.data
  if (!status)
    return {
      status: 0,
      message: 'Tiltwright could not be reached. Check the connection and try again.',
      fields: {},
    }
  return {
    status,
    message:
      body?.message ?? 'Something went wrong on our side. Nothing was lost; please try again.',
    code: body?.data?.code,
    fields: body?.data?.fields ?? {},
  }
}

export interface ApiOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE'
  body?: Record<string, unknown> | unknown[] | FormData
  query?: Record<string, unknown>
}

/** A deliberately plain signature: Nitro's route-typed $fetch overwhelms the type-checker. */
export type ApiFetch = <T = unknown>(url: string, options?: ApiOptions) => Promise<T>

export function useApi(): ApiFetch {
  const { $csrfFetch } = useNuxtApp()
  return $csrfFetch as unknown as ApiFetch
}
