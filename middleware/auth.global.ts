import type { Role } from '#shared/utils/roles'

declare module '#app' {
  interface PageMeta {
    /** Roles that may open the page; when absent, the page's navigation entry decides. */
    roles?: readonly Role[]
    /** Reachable without signing in (sign-in, set-password). */
    public?: boolean
  }
}

/**
 * User experience only: sends signed-out visitors to the sign-in page and explains a refusal
 * before the page loads. Every API route checks the session and role on the server itself.
 */
export default defineNuxtRouteMiddleware((to) => {
  // The server already decided the first page (and rendered any refusal); don't decide twice while hydrating.
  const nuxtApp = useNuxtApp()
  if (import.meta.client && nuxtApp.isHydrating && nuxtApp.payload.serverRendered) return

  const { loggedIn, user } = useUserSession()

  if (!loggedIn.value || !user.value) {
    if (to.meta.public) return
    return navigateTo({ path: '/login', query: to.fullPath === '/' ? {} : { next: to.fullPath } })
  }

  if (to.path === '/login') return navigateTo(safeNextPath(to.query.next))

  const section = sectionForPath(to.path)
  const allowed = to.meta.roles ?? section?.roles
  if (allowed && !allowed.includes(user.value.role)) {
    const place = section ? `the ${section.label} section` : 'this page'
    const openTo = allowed.map((role) => ROLE_LABELS[role]).join(', ')
    // A fatal error returned from middleware stops the navigation and shows error.vue, on server and client alike.
    return createError({
      status: 403,
      statusText: 'Not available to your role',
      message: `Your role, ${ROLE_LABELS[user.value.role]}, does not include ${place}. It is open to: ${openTo}.`,
      fatal: true,
    })
  }
})
