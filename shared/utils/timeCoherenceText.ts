/**
 * How a run's scenarios hang together in time, in one sentence for legends, area tables and the
 * briefing method text. With time-coherent noise of decorrelation time τ, the fine-scale detail of
 * a sample at lead times Δt apart has correlation exp(−Δt/τ) (leadNoiseWeights.ts); the sentence
 * gives that figure for the typical spacing of the lead times, because "coherent" alone would
 * overstate a τ that is short next to the spacing.
 */
import { leadCorrelation } from '../numerics/coherence/leadNoiseWeights'

/** Below this lead-to-lead correlation the detail is, for a reader, redrawn at each lead time. */
export const NEGLIGIBLE_LEAD_CORRELATION = 0.05

function rounded(v: number): string {
  return v >= 10 ? String(Math.round(v)) : String(Math.round(v * 10) / 10)
}

/** Median spacing of consecutive valid times, hours (null with fewer than two). */
export function typicalLeadSpacingHours(leadTimes: readonly string[]): number | null {
  if (leadTimes.length < 2) return null
  const gaps = leadTimes.slice(1).map((t, k) => (Date.parse(t) - Date.parse(leadTimes[k]!)) / 3600_000).sort((a, b) => a - b)
  return gaps[Math.floor((gaps.length - 1) / 2)]!
}

/**
 * The sentence: τ (hours) null when the samples were drawn without time-coherent noise; spacing in
 * hours between the lead times concerned (null: one lead time, nothing to say about time).
 */
export function timeCoherenceSentence(timeScaleHours: number | null, spacingHours: number | null): string {
  if (timeScaleHours === null || !Number.isFinite(timeScaleHours)) {
    return 'The fine-scale detail of each sample was drawn separately at each lead time, so only the coarse member links a scenario\'s times; chances "at any time" in a window may then run somewhat high for small areas.'
  }
  if (spacingHours === null) return `The fine-scale detail was drawn with time-coherent noise (decorrelation time about ${rounded(timeScaleHours)} h).`
  const rho = leadCorrelation(0, spacingHours, timeScaleHours)
  if (rho < NEGLIGIBLE_LEAD_CORRELATION) {
    return `The fine-scale detail was drawn with time-coherent noise, but its decorrelation time fitted from the members (about ${rounded(timeScaleHours)} h) is short next to the ${rounded(spacingHours)} h between lead times, so the detail is practically redrawn at each lead time and only the coarse member links a scenario's times.`
  }
  return `The fine-scale detail of a sample keeps a correlation of about ${rho.toFixed(2)} from one lead time to the next (${rounded(spacingHours)} h apart; decorrelation time about ${rounded(timeScaleHours)} h, fitted from the members), so a scenario hangs together in time.`
}
