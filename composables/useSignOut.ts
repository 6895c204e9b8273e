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
    // Loaded only now: the planner's store brings the model's form code, which no page but the
    // planner needs at first paint (modules/js-budget.ts).
    const { usePlannerStore } = await import('~/stores/planner')
    usePlannerStore().reset()
    // The last opened sheet and the overlay list belong to the person who signed out.
    clearNuxtData(key => key.startsWith('planner-'))
    await navigateTo(everywhere ? '/login?signedOut=everywhere' : '/')
  }
}
