import { defineStore } from 'pinia'

export type NoticeKind = 'success' | 'error' | 'info'

export interface Notice {
  id: number
  kind: NoticeKind
  text: string
}

/** How long a notice stays on screen unless dismissed (ms); errors stay until dismissed. */
const NOTICE_LIFETIME_MS = 6000

/**
 * Short confirmations shown across page changes ("Role changed", "Signed out").
 * Read out by screen readers through the live region in NoticeTray.
 */
export const useNoticesStore = defineStore('notices', () => {
  const notices = ref<Notice[]>([])
  let nextId = 1

  function dismiss(id: number) {
    notices.value = notices.value.filter((notice) => notice.id !== id)
  }

  function push(kind: NoticeKind, text: string) {
    const id = nextId++
    notices.value = [...notices.value, { id, kind, text }]
    if (import.meta.client && kind !== 'error') {
      setTimeout(() => dismiss(id), NOTICE_LIFETIME_MS)
    }
    return id
  }

  return {
    notices,
    dismiss,
    success: (text: string) => push('success', text),
    error: (text: string) => push('error', text),
    info: (text: string) => push('info', text),
  }
})
