/** Runs the map workspace can open: finished (or partly finished) downscaling, newest first. */
export interface WorkspaceRun {
  id: number
  name: string
  status: string
  isDemo: boolean
  standardName: string | null
  variable: string
  canonicalUnits: string
  displayUnits: string
  members: number
  leadTimes: string[]
  referenceTime: string | null
  settings: { factor: number; samplesPerMember: number } | null
  finishedAt: string | null
  progress?: { done: number; total: number }
}

export function isWorkspaceReady(run: WorkspaceRun): boolean {
  return run.settings !== null && (run.status === 'completed' || (run.progress?.done ?? 0) > 0)
}

export function useWorkspaceRuns() {
  return useFetch<{ runs: WorkspaceRun[] }>('/api/runs', {
    key: 'workspace-runs',
    transform: (data) => ({ runs: data.runs.filter(isWorkspaceReady) }),
  })
}
