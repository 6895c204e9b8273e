// Comfort only: the cart is for visitors (who may fill it before signing in) and teachers;
// signed-in roles that cannot buy get the 404 page. The server is the gate.
import { canBuy } from '~~/shared/utils/roles'

export default defineNuxtRouteMiddleware(() => {
  const { user } = useCurrentUser()
  if (user.value && !canBuy(user.value))
    return abortNavigation(createError({ statusCode: 404, statusMessage: 'Page not found' }))
})
