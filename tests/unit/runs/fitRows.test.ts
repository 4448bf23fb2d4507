// Sorting and filtering of the parameter table (pure helpers).
import { describe, expect, it } from 'vitest'
import { filterFitRows, sortFitRows } from '../../../composables/runs/fitRows'
import type { RunTask, TaskFit } from '../../../composables/runs/types'

function task(id: number, leadIndex: number, memberIndex: number, fit: Partial<TaskFit> | null, status: RunTask['status'] = 'done'): RunTask {
  return {
    id, leadIndex, memberIndex, status, attempts: 1, elapsedMs: 100 * id, error: null, startedAt: null, finishedAt: null,
    fit: fit && {
      kernel: 'matern32', lengthScale: 4, lengthScaleKm: 10, lengthScaleIntervalKm: [5, 20], variance: 1, mean: 0,
      logLikelihood: -10, atBound: null, method: 'exact', ...fit,
    },
  }
}

const tasks = [
  task(1, 0, 0, { lengthScaleKm: 30, variance: 4 }),
  task(2, 0, 1, { lengthScaleKm: 10, variance: 1, atBound: 'lower' }),
  task(3, 1, 0, null, 'running'),
  task(4, 1, 1, { lengthScaleKm: 20, variance: 9, atBound: 'upper' }),
]

describe('parameter table rows', () => {
  it('sorts by ℓ either way, with unfitted members last in both directions', () => {
    expect(sortFitRows(tasks, { key: 'lengthScale', direction: 'ascending' }).map((t) => t.id)).toEqual([2, 4, 1, 3])
    expect(sortFitRows(tasks, { key: 'lengthScale', direction: 'descending' }).map((t) => t.id)).toEqual([1, 4, 2, 3])
  })
  it('sorts σ by the square root of the variance and breaks ties by lead time then member', () => {
    expect(sortFitRows(tasks, { key: 'sigma', direction: 'descending' }).map((t) => t.id)).toEqual([4, 1, 2, 3])
    expect(sortFitRows(tasks, { key: 'kernel', direction: 'ascending' }).map((t) => t.id)).toEqual([1, 2, 4, 3])
    expect(sortFitRows(tasks, { key: 'member', direction: 'descending' }).map((t) => t.id)).toEqual([2, 4, 1, 3])
  })
  it('filters by lead time and by the bound flag', () => {
    expect(filterFitRows(tasks, { leadIndex: 1, onlyAtBound: false }).map((t) => t.id)).toEqual([3, 4])
    expect(filterFitRows(tasks, { leadIndex: null, onlyAtBound: true }).map((t) => t.id)).toEqual([2, 4])
  })
})
