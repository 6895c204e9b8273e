import { isAdmin } from '~~/shared/utils/roles'

export default defineNuxtRouteMiddleware((to) => {
  const { user } = useCurrentUser()
  if (!user.value) return navigateTo({ path: '/login', query: { next: to.fullPath } })
  if (!isAdmin(user.value))
    return abortNavigation(createError({ statusCode: 404, statusMessage: 'Page not found' }))
})
