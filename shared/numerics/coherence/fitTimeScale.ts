/**
 * Decorrelation time τ of the ensemble's perturbations, from the coarse members alone: at each lead
 * the anomalies are the members minus the ensemble mean, cell by cell; r_t is their Pearson
 * correlation between consecutive leads, pooled over members and cells; and τ is the least-squares
 * fit through the origin of −ln r_t = Δt_t/τ (the exponential correlation of an Ornstein–Uhlenbeck
 * process, as leadNoiseWeights.ts assumes): 1/τ̂ = Σ Δt (−ln r) / Σ Δt². Correlations are clamped
 * to [MIN_CORRELATION, MAX_CORRELATION] first. Pass the fields in the space the engine works in
 * (latent values for transformed variables) when that matters. Why coarse anomalies: they are the
 * only evidence a run carries about how fast its uncertainty evolves; sub-grid detail decorrelates
 * at least as fast, so this τ is on the coherent side.
 */

export interface TimeScaleFit {
  timeScaleHours: number
  /** Consecutive lead pairs: hours, pooled anomaly correlation, used in the fit or not. */
  pairs: { fromHours: number; toHours: number; correlation: number; used: boolean }[]
  /** True when no pair was usable and `fallbackHours` was returned. */
  fallback: boolean
}

export const MIN_CORRELATION = 0.01
export const MAX_CORRELATION = 0.999
/** Range τ̂ is kept in, hours. */
export const TIME_SCALE_RANGE: [number, number] = [1, 240]
/** τ used when the members give no usable lag correlation (one lead, one member, constant fields). */
export const DEFAULT_TIME_SCALE_HOURS = 12

/**
 * fields[t][m]: member m at lead t, row-major, all the same length, NaN = missing (a cell missing in
 * any member of either lead is left out of that pair). leadHours[t]: lead times, strictly increasing.
 */
export function fitTimeScale(fields: ArrayLike<number>[][], leadHours: ArrayLike<number>, fallbackHours = DEFAULT_TIME_SCALE_HOURS): TimeScaleFit {
  if (fields.length !== leadHours.length) throw new Error(`${fields.length} leads of fields but ${leadHours.length} lead times`)
  const pairs: TimeScaleFit['pairs'] = []
  let sxy = 0, sxx = 0
  for (let t = 1; t < fields.length; t++) {
    const dt = leadHours[t]! - leadHours[t - 1]!
    if (!(dt > 0)) throw new Error('lead times must be strictly increasing')
    const r = pooledAnomalyCorrelation(fields[t - 1]!, fields[t]!)
    const used = Number.isFinite(r)
    pairs.push({ fromHours: leadHours[t - 1]!, toHours: leadHours[t]!, correlation: r, used })
    if (!used) continue
    const clamped = Math.min(MAX_CORRELATION, Math.max(MIN_CORRELATION, r))
    sxy += dt * -Math.log(clamped); sxx += dt * dt
  }
  if (sxx === 0) return { timeScaleHours: fallbackHours, pairs, fallback: true }
  const tau = sxx / sxy
  return { timeScaleHours: Math.min(TIME_SCALE_RANGE[1], Math.max(TIME_SCALE_RANGE[0], tau)), pairs, fallback: false }
}

/** Pooled correlation of ensemble anomalies between two leads (NaN when undefined). */
export function pooledAnomalyCorrelation(a: ArrayLike<number>[], b: ArrayLike<number>[]): number {
  const members = a.length
  if (members !== b.length) throw new Error(`${a.length} members at one lead and ${b.length} at the next`)
  if (members < 2) return NaN
  const cells = a[0]!.length
  let sab = 0, saa = 0, sbb = 0
  for (let k = 0; k < cells; k++) {
    let ma = 0, mb = 0, ok = true
    for (let m = 0; m < members; m++) {
      if (a[m]!.length !== cells || b[m]!.length !== cells) throw new Error('member fields differ in size')
      const va = a[m]![k]!, vb = b[m]![k]!
      if (!Number.isFinite(va) || !Number.isFinite(vb)) { ok = false; break }
      ma += va; mb += vb
    }
    if (!ok) continue
    ma /= members; mb /= members
    for (let m = 0; m < members; m++) {
      const da = a[m]![k]! - ma, db = b[m]![k]! - mb
      sab += da * db; saa += da * da; sbb += db * db
    }
  }
  return saa > 0 && sbb > 0 ? sab / Math.sqrt(saa * sbb) : NaN
}
