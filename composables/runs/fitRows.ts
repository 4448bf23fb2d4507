/**
 * The parameter table's rows: one per member and lead time, with sortable keys and filters.
 */
import type { RunTask, TaskStatus } from './types'
import { standardDeviation } from './display'

export type FitSortKey = 'lead' | 'member' | 'status' | 'kernel' | 'lengthScale' | 'sigma' | 'mean' | 'logLikelihood' | 'method' | 'attempts' | 'time'
export interface FitSort { key: FitSortKey; direction: 'ascending' | 'descending' }

const STATUS_ORDER: Record<TaskStatus, number> = { failed: 0, running: 1, pending: 2, cancelled: 3, done: 4 }

/** The value a row is sorted by; missing values (no fit yet) sort last in either direction. */
export function fitSortValue(task: RunTask, key: FitSortKey): number | string | null {
  const fit = task.fit
  switch (key) {
    case 'lead': return task.leadIndex
    case 'member': return task.memberIndex
    case 'status': return STATUS_ORDER[task.status]
    case 'kernel': return fit?.kernel ?? null
    case 'lengthScale': return fit?.lengthScaleKm ?? null
    case 'sigma': return fit ? standardDeviation(fit.variance) : null
    case 'mean': return fit?.mean ?? null
    case 'logLikelihood': return fit?.logLikelihood ?? null
    case 'method': return fit?.method ?? null
    case 'attempts': return task.attempts
    case 'time': return task.elapsedMs
  }
}

/** Sorted copy; ties keep lead-time then member order so the table never shuffles between polls. */
export function sortFitRows(tasks: RunTask[], sort: FitSort): RunTask[] {
  const sign = sort.direction === 'ascending' ? 1 : -1
  return [...tasks].sort((a, b) => {
    const va = fitSortValue(a, sort.key), vb = fitSortValue(b, sort.key)
    const missingA = va === null || (typeof va === 'number' && Number.isNaN(va))
    const missingB = vb === null || (typeof vb === 'number' && Number.isNaN(vb))
    if (missingA !== missingB) return missingA ? 1 : -1
    if (!missingA && va !== vb) {
      const order = typeof va === 'string' || typeof vb === 'string' ? String(va).localeCompare(String(vb)) : (va as number) - (vb as number)
      if (order !== 0) return sign * order
    }
    return a.leadIndex - b.leadIndex || a.memberIndex - b.memberIndex
  })
}

export interface FitFilter { leadIndex: number | null; onlyAtBound: boolean }

export function filterFitRows(tasks: RunTask[], filter: FitFilter): RunTask[] {
  return tasks.filter((t) => (filter.leadIndex === null || t.leadIndex === filter.leadIndex) && (!filter.onlyAtBound || Boolean(t.fit?.atBound)))
}
