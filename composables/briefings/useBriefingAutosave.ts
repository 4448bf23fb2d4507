/**
 * Autosave for the builder: changes are merged into one pending PATCH, sent after a short pause
 * with the briefing's lockVersion, one request at a time. A 409 (someone else saved first) stops
 * saving until the page is reloaded; every state is shown to the person typing.
 */
import type { Ref } from 'vue'
import type { UpdateBriefingInput } from '#shared/schemas/briefings'
import type { BriefingView } from './types'

export type SaveState = 'idle' | 'pending' | 'saving' | 'saved' | 'conflict' | 'error'
export type BriefingPatch = Omit<Partial<UpdateBriefingInput>, 'lockVersion'>

export function useBriefingAutosave(id: Ref<number>, view: Ref<BriefingView | null | undefined>) {
  const state = ref<SaveState>('idle')
  const message = ref<string | null>(null)
  let pending: BriefingPatch = {}
  let timer: ReturnType<typeof setTimeout> | null = null
  let running: Promise<void> | null = null

  function merge(patch: BriefingPatch) {
    const edits = [...(pending.statementEdits ?? [])]
    for (const e of patch.statementEdits ?? []) {
      const k = edits.findIndex((x) => x.key === e.key)
      if (k >= 0) edits[k] = { ...edits[k]!, ...e }
      else edits.push(e)
    }
    pending = { ...pending, ...patch, ...(edits.length ? { statementEdits: edits } : {}) }
  }

  /** Sends everything pending now; resolves true when it was saved. */
  async function flush(): Promise<boolean> {
    if (timer) { clearTimeout(timer); timer = null }
    while (running) await running
    if (state.value === 'conflict') return false
    if (Object.keys(pending).length === 0 || !view.value) return state.value !== 'error'
    const body = { ...pending, lockVersion: view.value.briefing.lockVersion }
    pending = {}
    state.value = 'saving'
    running = (async () => {
      try {
        view.value = await $fetch<BriefingView>(`/api/briefings/${id.value}`, { method: 'PATCH', body })
        state.value = 'saved'
        message.value = null
      } catch (err) {
        message.value = apiErrorMessage(err)
        state.value = apiErrorStatus(err) === 409 ? 'conflict' : 'error'
      }
    })()
    await running
    running = null
    return (state.value as SaveState) === 'saved'
  }

  /** Adds a change; it is sent after `delayMs` without further changes. */
  function queue(patch: BriefingPatch, delayMs = 800) {
    if (state.value === 'conflict') return
    merge(patch)
    state.value = 'pending'
    if (timer) clearTimeout(timer)
    timer = setTimeout(() => { void flush() }, delayMs)
  }

  function reset() {
    pending = {}
    state.value = 'idle'
    message.value = null
  }

  return { state, message, queue, flush, reset }
}
