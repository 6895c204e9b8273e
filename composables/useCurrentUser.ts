import type { SessionUser } from '~~/shared/utils/roles'

/** The signed-in user (from nuxt-auth-utils' session) or null. */
export function useCurrentUser() {
  const { user, loggedIn, fetch, clear } = useUserSession()
  const current = computed(() => (loggedIn.value ? (user.value as SessionUser) : null))
  return { user: current, refresh: fetch, clear }
}
