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

let fetchingToken: Promise<void> | undefined

/** Makes sure the page has a CSRF token before a write. A page rendered for a signed-in person
 *  carries it in its `csrf-token` meta tag; a page served to signed-out visitors is a snapshot
 *  shared by everyone and carries none, so the token is fetched once from /api/csrf-token (which
 *  gives this browser its own secret cookie) and written into that meta tag, where nuxt-csurf's
 *  useCsrf() reads it. One request at a time: two would each set a secret, and one would lose. */
export function ensureCsrfToken(): Promise<void> {
  if (import.meta.server) return Promise.resolve()
  const meta = () => document.querySelector('meta[name="csrf-token"]')
  if (meta()?.getAttribute('content')) return Promise.resolve()
  fetchingToken ??= $fetch<{ token: string }>('/api/csrf-token')
    .then(({ token }) => {
      const tag = meta() ?? document.head.appendChild(document.createElement('meta'))
      tag.setAttribute('name', 'csrf-token')
      tag.setAttribute('content', token)
    })
    .finally(() => {
      fetchingToken = undefined
    })
  return fetchingToken
}

export function useApi(): ApiFetch {
  const { $csrfFetch } = useNuxtApp()
  const csrfFetch = $csrfFetch as unknown as ApiFetch
  return async function api<T>(url: string, options?: ApiOptions): Promise<T> {
    if (options?.method && options.method !== 'GET') await ensureCsrfToken()
    return csrfFetch<T>(url, options)
  }
}
