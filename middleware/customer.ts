import { isCustomer } from '~~/shared/utils/roles'

// Comfort only: pages for teachers and builders (the server refuses other roles anyway).
export default defineNuxtRouteMiddleware((to) => {
  const { user } = useCurrentUser()
  if (!user.value) return navigateTo({ path: '/login', query: { next: to.fullPath } })
  if (!isCustomer(user.value))
    return abortNavigation(createError({ statusCode: 404, statusMessage: 'Page not found' }))
})
