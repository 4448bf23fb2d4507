/**
 * The parameter table's rows: one per member and lead time, with sortable keys and filters.
 */
import type { RunTask, TaskStatus } from './types'
import { standardDeviation } from './display'
import { anisotropySortValue, isAllDryFit } from './fitStructure'

export type FitSortKey = 'lead' | 'member' | 'status' | 'kernel' | 'lengthScale' | 'anisotropy' | 'sigma' | 'mean' | 'logLikelihood' | 'method' | 'attempts' | 'time'
export interface FitSort { key: FitSortKey; direction: 'ascending' | 'descending' }

const STATUS_ORDER: Record<TaskStatus, number> = { failed: 0, running: 1, pending: 2, cancelled: 3, done: 4 }

/** Keys whose values an all-dry member does not have (its fit holds placeholders, not estimates). */
const FITTED_KEYS: ReadonlySet<FitSortKey> = new Set(['kernel', 'lengthScale', 'anisotropy', 'sigma', 'mean', 'logLikelihood', 'method'])

/**
 * The value a row is sorted by; missing values sort last in either direction: all-dry members
 * (nothing to fit) for the fitted quantities, then members not fitted yet.
 */
export function fitSortValue(task: RunTask, key: FitSortKey): number | string | null {
  const fit = task.fit && FITTED_KEYS.has(key) && isAllDryFit(task.fit) ? null : task.fit
  switch (key) {
    case 'lead': return task.leadIndex
    case 'member': return task.memberIndex
    case 'status': return STATUS_ORDER[task.status]
    case 'kernel': return fit?.kernel ?? null
    case 'lengthScale': return fit?.lengthScaleKm ?? null
    case 'anisotropy': return anisotropySortValue(fit)
    case 'sigma': return fit ? standardDeviation(fit.variance) : null
    case 'mean': return fit?.mean ?? null
    case 'logLikelihood': return fit?.logLikelihood ?? null
    case 'method': return fit?.method ?? null
    case 'attempts': return task.attempts
    case 'time': return task.elapsedMs
  }
}

/** 0 = has a value; among missing values, all-dry members (1) come before members with no fit (2). */
function missingRank(task: RunTask, value: number | string | null): number {
  if (value !== null && !(typeof value === 'number' && Number.isNaN(value))) return 0
  return task.fit && isAllDryFit(task.fit) ? 1 : 2
}

/** Sorted copy; ties keep lead-time then member order so the table never shuffles between polls. */
export function sortFitRows(tasks: RunTask[], sort: FitSort): RunTask[] {
  const sign = sort.direction === 'ascending' ? 1 : -1
  return [...tasks].sort((a, b) => {
    const va = fitSortValue(a, sort.key), vb = fitSortValue(b, sort.key)
    const rankA = missingRank(a, va), rankB = missingRank(b, vb)
    if (rankA !== rankB) return rankA - rankB
    const missingA = rankA > 0
    if (!missingA && va !== vb) {
      const order = typeof va === 'string' || typeof vb === 'string' ? String(va).localeCompare(String(vb)) : (va as number) - (vb as number)
      if (order !== 0) return sign * order
    }
    return a.leadIndex - b.leadIndex || a.memberIndex - b.memberIndex
  })
}

export interface FitFilter { leadIndex: number | null; onlyAtBound: boolean }

/** Rows kept by the lead-time filter and, optionally, only fits at a search bound. */
export function filterFitRows(tasks: RunTask[], filter: FitFilter): RunTask[] {
  return tasks.filter((t) => (filter.leadIndex === null || t.leadIndex === filter.leadIndex) && (!filter.onlyAtBound || Boolean(t.fit?.atBound)))
}
