/** Ends the session on the server, refreshes the client's copy and returns to the sign-in page. */
export function useSignOut() {
  const session = useUserSession()
  const notices = useNoticesStore()
  return async function signOut() {
    try {
      await $fetch('/api/auth/logout', { method: 'POST' })
    } catch (error) {
      // A session that has already expired is as good as signed out; anything else is worth saying.
      if (apiErrorStatus(error) !== 401) notices.error(apiErrorMessage(error, 'Signing out failed.'))
    }
    await session.fetch()
    if (!session.loggedIn.value) {
      notices.info('You are signed out.')
      await navigateTo('/login')
    }
  }
}
