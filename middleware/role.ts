// Comfort only, the server is the gate: a page names who it is for in its meta,
//   definePageMeta({ middleware: 'role', roles: ['admin'] })
// Signed-out visitors go to sign in (unless 'visitor' is listed: the cart, which a visitor may
// fill before signing in); a signed-in role the page is not for gets the 404 page.
import type { Role } from '~~/shared/utils/roles'

export type PageAudience = Role | 'visitor'

declare module '#app' {
  interface PageMeta {
    /** Who the page is for; read by middleware/role.ts. */
    roles?: PageAudience[]
  }
}

export default defineNuxtRouteMiddleware((to) => {
  const roles = to.meta.roles
  if (!roles) return
  const { user } = useCurrentUser()
  if (!user.value) {
    if (roles.includes('visitor')) return
    return navigateTo({ path: '/login', query: { next: to.fullPath } })
  }
  if (!roles.includes(user.value.role))
    return abortNavigation(createError({ statusCode: 404, statusMessage: 'Page not found' }))
})
