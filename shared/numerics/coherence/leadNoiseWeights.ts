/**
 * Weights that make white noise autoregressive across lead times while each lead can be computed on
 * its own. Sampling an Ornstein–Uhlenbeck process at lead times T₀ < T₁ < … gives the AR(1) recursion
 *   w_t = ρ_t w_{t−1} + √(1 − ρ_t²) ε_t,  ρ_t = exp(−(T_t − T_{t−1})/τ),  w₀ = ε₀,
 * whose solution is a fixed combination of the innovations, w_t = Σ_{s≤t} c_{t,s} ε_s with
 *   c_{t,0} = e^{−(T_t − T₀)/τ},  c_{t,s} = √(1 − ρ_s²) e^{−(T_t − T_s)/τ}  (s ≥ 1),  Σ_s c²_{t,s} = 1,
 * so corr(w_t, w_u) = e^{−|T_t − T_u|/τ} for any two leads (uneven spacing included). A task at lead t
 * regenerates ε₀…ε_t from their seeds; the oldest innovations are dropped while their total weight
 * Σ c² stays below `truncation` (the rest renormalised). By Cauchy–Schwarz that changes a correlation
 * by at most about √truncation (0.03 by default), and only between leads several τ apart, whose
 * correlation is itself of that order; each innovation costs one noise plane per sample, so this
 * bounds the work at late leads to about ln(1/truncation)·τ/(2Δt) planes.
 */

export interface LeadNoiseWeights {
  /** Index of the oldest innovation used. */
  first: number
  /** c_{t,s} for s = first…leadIndex (Σ c² = 1). */
  weights: Float64Array
  /** Weight dropped by the truncation (before renormalising). */
  dropped: number
}

/** Default truncation of the innovation weights (share of variance). */
export const DEFAULT_NOISE_TRUNCATION = 1e-3

/** Checks lead hours (finite, strictly increasing), a lead index into them and τ ≥ 0 (hours; ∞ allowed). */
export function checkLeadTimes(leadHours: ArrayLike<number>, leadIndex: number, timeScaleHours: number): void {
  if (!Number.isInteger(leadIndex) || leadIndex < 0 || leadIndex >= leadHours.length) throw new Error(`lead index ${leadIndex} is outside the ${leadHours.length} lead times given`)
  for (let t = 0; t < leadHours.length; t++) {
    if (!Number.isFinite(leadHours[t]!)) throw new Error(`lead time ${t} is not a finite number of hours`)
    if (t > 0 && !(leadHours[t]! > leadHours[t - 1]!)) throw new Error('lead times must be strictly increasing')
  }
  if (!(timeScaleHours >= 0)) throw new Error(`time scale must be ≥ 0 hours, got ${timeScaleHours}`)
}

/** The innovation weights of lead `leadIndex` (see module note). τ = 0: independent leads; τ = ∞: one shared noise. */
export function leadNoiseWeights(leadHours: ArrayLike<number>, leadIndex: number, timeScaleHours: number, truncation = DEFAULT_NOISE_TRUNCATION): LeadNoiseWeights {
  checkLeadTimes(leadHours, leadIndex, timeScaleHours)
  const t = leadIndex
  const decay = (from: number) => (timeScaleHours === 0 ? (from === t ? 1 : 0) : Math.exp(-(leadHours[t]! - leadHours[from]!) / timeScaleHours))
  const c = new Float64Array(t + 1)
  c[0] = decay(0)
  for (let s = 1; s <= t; s++) {
    const rho = timeScaleHours === 0 ? 0 : Math.exp(-(leadHours[s]! - leadHours[s - 1]!) / timeScaleHours)
    c[s] = Math.sqrt(Math.max(0, 1 - rho * rho)) * decay(s)
  }
  let first = 0, dropped = 0
  while (first < t && dropped + c[first]! ** 2 <= truncation) dropped += c[first++]! ** 2
  let total = 0
  for (let s = first; s <= t; s++) total += c[s]! ** 2
  const scale = 1 / Math.sqrt(total)
  return { first, weights: c.subarray(first).map((v) => v * scale), dropped }
}

/** corr(w_t, w_u) = exp(−|T_t − T_u|/τ) of the untruncated process. */
export function leadCorrelation(hoursA: number, hoursB: number, timeScaleHours: number): number {
  if (hoursA === hoursB) return 1
  return timeScaleHours === 0 ? 0 : Math.exp(-Math.abs(hoursA - hoursB) / timeScaleHours)
}

/**
 * True when, after truncation, lead `leadIndex` shares no innovation with any other lead: it uses only
 * its own, and the next lead (hence every later one) has dropped it. Its noise is then independent of
 * all other leads and may be drawn any way (e.g. the engine's seeded spectral draw, one FFT cheaper).
 * Undecidable without the next lead's time: false when leadIndex is the last lead given but not the
 * last of the run (`isLastLead` false).
 */
export function isIsolatedLead(leadHours: ArrayLike<number>, leadIndex: number, timeScaleHours: number, truncation = DEFAULT_NOISE_TRUNCATION, isLastLead = false): boolean {
  if (leadNoiseWeights(leadHours, leadIndex, timeScaleHours, truncation).first !== leadIndex) return false
  if (leadIndex + 1 >= leadHours.length) return isLastLead
  return leadNoiseWeights(leadHours, leadIndex + 1, timeScaleHours, truncation).first > leadIndex
}
