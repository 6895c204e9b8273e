// Comfort only: the school's pages (orders, quotes, checkout) are for teachers. Signed-out
// visitors go to sign in; other roles get the 404 page. The server is the gate.
import { canBuy } from '~~/shared/utils/roles'

export default defineNuxtRouteMiddleware((to) => {
  const { user } = useCurrentUser()
  if (!user.value) return navigateTo({ path: '/login', query: { next: to.fullPath } })
  if (!canBuy(user.value))
    return abortNavigation(createError({ statusCode: 404, statusMessage: 'Page not found' }))
})
