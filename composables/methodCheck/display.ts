/** Display helpers for the method-check pages: series styles (line, dash and marker, never colour alone), statuses, numbers. */
import { formatNumber } from '#shared/numerics/pipeline/methodCheckSummary'
import type { MethodCheckStatus } from './types'

export { formatNumber }

export type MarkerShape = 'circle' | 'square' | 'triangle' | 'diamond' | 'cross' | 'none'
export interface SeriesStyle { stroke: string; width: number; dash?: string; marker: MarkerShape }

// Palette hexes from tailwind.config.ts; every pair is also told apart by dash and marker.
const STYLES: Record<string, SeriesStyle> = {
  truth: { stroke: '#182535', width: 2.5, marker: 'none' },
  samples: { stroke: '#16766f', width: 2.5, marker: 'circle' },
  ensemble: { stroke: '#16766f', width: 2.5, marker: 'circle' },
  mean: { stroke: '#861b41', width: 2, dash: '7 4', marker: 'square' },
  nearest: { stroke: '#565f67', width: 1.5, dash: '2 3', marker: 'cross' },
  bilinear: { stroke: '#4f6885', width: 1.5, dash: '10 4', marker: 'triangle' },
  'bilinear-bm': { stroke: '#233345', width: 1.5, dash: '10 4 2 4', marker: 'triangle' },
  bicubic: { stroke: '#6f87a2', width: 1.5, dash: '4 2', marker: 'diamond' },
  'bicubic-bm': { stroke: '#2f4258', width: 1.5, dash: '4 2 1 2', marker: 'diamond' },
}

export function seriesStyle(id: string): SeriesStyle {
  return STYLES[id] ?? { stroke: '#3c536d', width: 1.5, marker: 'none' }
}

/** The fill of the band between the lowest and highest sample spectra. */
export const SAMPLE_BAND_FILL = '#a6e2d9'

/** Baselines drawn at first; the others can be switched on in the legend. */
export const BASELINES_SHOWN_FIRST = ['nearest', 'bilinear', 'bicubic-bm']

export interface StatusInfo { label: string; tone: string; icon: 'clock' | 'spinner' | 'check' | 'alert' }

export function statusInfo(status: MethodCheckStatus): StatusInfo {
  switch (status) {
    case 'queued': return { label: 'Waiting', tone: 'border-mist-500 bg-white text-ink-900', icon: 'clock' }
    case 'running': return { label: 'Running', tone: 'border-tide-700 bg-tide-50 text-tide-800', icon: 'spinner' }
    case 'completed': return { label: 'Done', tone: 'border-tide-700 bg-tide-100 text-tide-800', icon: 'check' }
    case 'failed': return { label: 'Failed', tone: 'border-berry-700 bg-berry-50 text-berry-700', icon: 'alert' }
  }
}

/** "1 min 5 s", "12 s", "800 ms". */
export function formatMs(ms: number | null | undefined): string {
  if (ms === null || ms === undefined || !Number.isFinite(ms)) return '—'
  if (ms < 1000) return `${Math.round(ms)} ms`
  const s = Math.round(ms / 1000)
  return s < 60 ? `${s} s` : `${Math.floor(s / 60)} min ${s % 60} s`
}

/** A length in fine cells shown in km when the spacing is known. */
export function formatCells(cells: number, spacingKm: number | null | undefined): string {
  if (!spacingKm) return `${formatNumber(cells)} cells`
  const km = cells * spacingKm
  return `${km >= 10 ? Math.round(km) : Number(km.toFixed(1))} km`
}

/** "12 %" from a share. */
export function formatShare(x: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—'
  const p = 100 * x
  return `${Math.abs(p) >= 10 ? Math.round(p) : Number(p.toFixed(1))} %`
}
