/**
 * Calls to the forecast-run API (server/api/runs/**). Reads on pages go through useFetch;
 * these are the writes, the upload with progress, and the profile of one task.
 */
import { onBeforeUnmount, onMounted, watch, type Ref } from 'vue'
import type { DownscaleSettingsInput } from '#shared/schemas/runs'
import type { RunDetailResponse, RunSummaryDto, TaskProfileResponse, UploadResponse } from './runs/types'

/** An error shaped like a failed $fetch, so apiErrorMessage / apiErrorStatus read it the same way. */
export class RunUploadError extends Error {
  constructor(message: string, readonly statusCode: number | undefined, readonly data: unknown) {
    super(message)
  }
}

export interface UploadHandle {
  /** Resolves with the staged run and its preview; rejects with RunUploadError. */
  done: Promise<UploadResponse>
  abort: () => void
}

/**
 * Sends the file as the raw request body. XMLHttpRequest rather than fetch because only it
 * reports upload progress; `onProgress` receives bytes sent and the total.
 */
function uploadEnsembleFile(file: File, onProgress: (sent: number, total: number) => void): UploadHandle {
  const xhr = new XMLHttpRequest()
  const done = new Promise<UploadResponse>((resolve, reject) => {
    xhr.open('POST', `/api/runs/uploads?fileName=${encodeURIComponent(file.name)}`)
    xhr.setRequestHeader('content-type', 'application/octet-stream')
    xhr.setRequestHeader('accept', 'application/json')
    xhr.responseType = 'text'
    xhr.upload.onprogress = (event) => onProgress(event.loaded, event.lengthComputable ? event.total : file.size)
    xhr.onload = () => {
      let body: unknown = null
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null
      } catch {
        body = null
      }
      if (xhr.status >= 200 && xhr.status < 300 && body) resolve(body as UploadResponse)
      else reject(new RunUploadError(`upload answered ${xhr.status}`, xhr.status, body))
    }
    // No answer at all: the connection failed, or the server closed it early (e.g. over the size limit).
    xhr.onerror = () => reject(new RunUploadError('upload failed', undefined, null))
    xhr.onabort = () => reject(new RunUploadError('upload aborted', 0, { message: 'The upload was stopped; nothing was stored.' }))
    xhr.send(file)
  })
  return { done, abort: () => xhr.abort() }
}

/** The run API as the pages use it. */
export function useRuns() {
  return {
    upload: uploadEnsembleFile,
    confirm: (id: number, name: string) =>
      $fetch<{ run: RunSummaryDto }>(`/api/runs/${id}/confirm`, { method: 'POST', body: { name } }),
    /** Discards a staged preview or deletes a run that is not being processed. */
    remove: (id: number) => $fetch(`/api/runs/${id}`, { method: 'DELETE' }),
    downscale: (id: number, settings: DownscaleSettingsInput) =>
      $fetch<RunDetailResponse>(`/api/runs/${id}/downscale`, { method: 'POST', body: settings }),
    cancel: (id: number) => $fetch<RunDetailResponse>(`/api/runs/${id}/cancel`, { method: 'POST' }),
    taskProfile: (runId: number, taskId: number) => $fetch<TaskProfileResponse>(`/api/runs/${runId}/tasks/${taskId}`),
  }
}

/**
 * Calls `refresh` every `intervalMs` while `active` is true and the page is mounted; each call
 * waits for the previous one, so a slow answer never piles requests up.
 */
export function useRunPolling(refresh: () => Promise<unknown>, active: Ref<boolean>, intervalMs = 2000) {
  let timer: ReturnType<typeof setTimeout> | null = null
  let mounted = false
  const stop = () => {
    if (timer) clearTimeout(timer)
    timer = null
  }
  const schedule = () => {
    stop()
    if (!mounted || !active.value) return
    timer = setTimeout(async () => {
      try {
        await refresh()
      } finally {
        schedule()
      }
    }, intervalMs)
  }
  onMounted(() => {
    mounted = true
    schedule()
  })
  onBeforeUnmount(() => {
    mounted = false
    stop()
  })
  watch(active, (on) => (on ? schedule() : stop()))
}
