/**
 * Where to go after signing in. Only same-site paths are followed ("/runs?x=1"), never
 * "//host" or "https://…", so a crafted sign-in link cannot send anyone elsewhere.
 */
export function safeNextPath(next: unknown): string {
  const value = Array.isArray(next) ? next[0] : next
  if (typeof value !== 'string') return '/'
  if (!value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return '/'
  if (value === '/login' || value.startsWith('/login?')) return '/'
  return value
}

/** The navigation section a path belongs to (its own entry or the one it sits under). */
export function sectionForPath(path: string): NavItem | undefined {
  return NAV_ITEMS.find((item) => path === item.to || path.startsWith(`${item.to}/`))
}
