/** Signing out of this browser, or out of every browser at once. Either way the session is
 *  re-read (now empty) and the shared school computer keeps no cart, draft or opened sheet. */
export function useSignOut() {
  const api = useApi()
  const { refresh } = useCurrentUser()
  return async (everywhere = false) => {
    if (everywhere) await api('/api/account/sessions', { method: 'DELETE' })
    else await api('/api/auth/logout', { method: 'POST' })
    await refresh()
    useCartStore().reset()
    usePlannerStore().reset()
    // The last opened sheet and the overlay list belong to the person who signed out.
    clearNuxtData(key => key.startsWith('planner-'))
    await navigateTo(everywhere ? '/login?signedOut=everywhere' : '/')
  }
}
