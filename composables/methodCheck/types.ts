/** Shapes the method-check API answers (server/utils/methodChecks.ts), as the pages use them. */
import type { MethodCheckHeadline, MethodCheckReport, MethodCheckSettings } from '#shared/numerics/pipeline/methodCheckReport'
import type { BatchSummary } from '#shared/numerics/pipeline/methodCheckBatch'

export type { MethodCheckHeadline, MethodCheckReport, MethodCheckSettings, BatchSummary }

export type MethodCheckStatus = 'queued' | 'running' | 'completed' | 'failed'

export interface TruthDto {
  id: number
  name: string
  description: string | null
  isDemo: boolean
  demoKey: string | null
  variable: string
  standardName: string | null
  canonicalUnits: string
  displayUnits: string
  nx: number
  ny: number
  spacingKm: number
  validTime: string | null
  memberIndex: number
  leadIndex: number
  sourceFileName: string | null
  stats: { min: number; max: number; mean: number; std: number }
  createdAt: string
}

export interface TruthSourceDto { kind: 'upload' | 'demo'; name: string; truthId: number | null; demoKey?: string; fileName?: string; memberIndex: number; leadIndex: number }

export interface CheckListItem {
  id: number
  name: string
  status: MethodCheckStatus
  progress: number
  stage: string | null
  error: string | null
  settings: MethodCheckSettings
  truthSource: TruthSourceDto
  truthNx: number
  truthNy: number
  truthSpacingKm: number
  truthUnits: string
  batchId: number | null
  authorName: string | null
  attempts: number
  createdAt: string
  startedAt: string | null
  finishedAt: string | null
  elapsedMs: number | null
  elapsedSoFarMs: number
  estimateMs: number | null
  headline: MethodCheckHeadline | null
}

export interface CheckDetail extends CheckListItem { report: MethodCheckReport | null }

export interface BatchListItem { id: number; name: string; createdAt: string; authorName: string | null; cases: number; completed: number; failed: number; settings: Omit<MethodCheckSettings, 'factor'> & { factors: number[] } }

export interface BatchDetail {
  batch: { id: number; name: string; createdAt: string; settings: BatchListItem['settings'] }
  cases: CheckListItem[]
  summary: BatchSummary
  byFactor: { factor: number; summary: BatchSummary }[]
}
