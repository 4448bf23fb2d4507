/**
 * Calls to the method-check API (server/api/method-checks/**). Reads on pages go through useFetch;
 * these are the writes and the truth upload (XMLHttpRequest, for upload progress).
 */
import { onBeforeUnmount, onMounted, watch, type Ref } from 'vue'
import type { CreateMethodCheckBatchInput, CreateMethodCheckInput } from '#shared/schemas/methodChecks'
import type { BatchDetail, CheckDetail, TruthDto } from './methodCheck/types'

/** Shaped like a failed $fetch, so apiErrorMessage reads it the same way. */
export class TruthUploadError extends Error {
  constructor(message: string, readonly statusCode: number | undefined, readonly data: unknown) { super(message) }
}

function uploadTruth(file: File, opts: { member: number; lead: number }, onProgress: (sent: number, total: number) => void): Promise<{ truth: TruthDto }> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest()
    const q = new URLSearchParams({ fileName: file.name, member: String(opts.member), lead: String(opts.lead) })
    xhr.open('POST', `/api/method-checks/truths?${q}`)
    xhr.setRequestHeader('content-type', 'application/octet-stream')
    xhr.setRequestHeader('accept', 'application/json')
    xhr.upload.onprogress = (e) => onProgress(e.loaded, e.lengthComputable ? e.total : file.size)
    xhr.onload = () => {
      let body: unknown = null
      try { body = xhr.responseText ? JSON.parse(xhr.responseText) : null } catch { body = null }
      if (xhr.status >= 200 && xhr.status < 300 && body) resolve(body as { truth: TruthDto })
      else reject(new TruthUploadError(`upload answered ${xhr.status}`, xhr.status, body))
    }
    xhr.onerror = () => reject(new TruthUploadError('upload failed', undefined, null))
    xhr.send(file)
  })
}

export function useMethodCheckApi() {
  return {
    uploadTruth,
    addDemoTruths: () => $fetch<{ added: number; truths: TruthDto[] }>('/api/method-checks/truths/demo', { method: 'POST', body: {} }),
    removeTruth: (id: number) => $fetch(`/api/method-checks/truths/${id}`, { method: 'DELETE' }),
    create: (input: Partial<CreateMethodCheckInput> & Pick<CreateMethodCheckInput, 'truthId' | 'factor'>) =>
      $fetch<{ check: CheckDetail }>('/api/method-checks', { method: 'POST', body: input }),
    createBatch: (input: Partial<CreateMethodCheckBatchInput> & Pick<CreateMethodCheckBatchInput, 'name' | 'truthIds' | 'factors'>) =>
      $fetch<BatchDetail>('/api/method-checks/batches', { method: 'POST', body: input }),
    remove: (id: number) => $fetch(`/api/method-checks/${id}`, { method: 'DELETE' }),
    removeBatch: (id: number) => $fetch(`/api/method-checks/batches/${id}`, { method: 'DELETE' }),
  }
}

/** Calls `refresh` every `intervalMs` while `active` is true and the page is mounted, one call at a time. */
export function useMethodCheckPolling(refresh: () => Promise<unknown>, active: Ref<boolean>, intervalMs = 1500) {
  let timer: ReturnType<typeof setTimeout> | null = null
  let mounted = false
  const stop = () => { if (timer) clearTimeout(timer); timer = null }
  const schedule = () => {
    stop()
    if (!mounted || !active.value) return
    timer = setTimeout(async () => { try { await refresh() } finally { schedule() } }, intervalMs)
  }
  onMounted(() => { mounted = true; schedule() })
  onBeforeUnmount(() => { mounted = false; stop() })
  watch(active, (on) => (on ? schedule() : stop()))
}
