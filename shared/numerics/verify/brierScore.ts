/**
 * Brier score (Brier 1950) and its decomposition (Murphy 1973, J. Appl. Meteor. 12:595):
 * BS = (1/M) Σ (pᵢ − oᵢ)² = reliability − resolution + uncertainty, with
 * reliability = (1/M) Σ_b n_b (p_b − ō_b)², resolution = (1/M) Σ_b n_b (ō_b − ō)²,
 * uncertainty = ō(1 − ō), the bins b being the distinct forecast values. Binning by distinct
 * values (e.g. k/N for N members) makes the decomposition exact, up to rounding.
 */

export interface BrierBin { probability: number; count: number; observedFrequency: number }

export interface BrierDecomposition {
  score: number
  reliability: number
  resolution: number
  uncertainty: number
  baseRate: number
  /** One bin per distinct forecast probability, ascending (a reliability diagram's points). */
  bins: BrierBin[]
}

/** Brier score of probabilities in [0, 1] against 0/1 outcomes, with Murphy's decomposition. */
export function brierScore(probability: ArrayLike<number>, outcome: ArrayLike<number>): BrierDecomposition {
  const m = probability.length
  if (outcome.length !== m) throw new Error(`${m} probabilities but ${outcome.length} outcomes`)
  if (m === 0) throw new Error('cannot score an empty set')
  const groups = new Map<number, { count: number; events: number }>()
  let score = 0, events = 0
  for (let k = 0; k < m; k++) {
    const p = probability[k]!, o = outcome[k]!
    if (!(p >= 0 && p <= 1)) throw new Error(`probability ${k} is ${p}, outside [0, 1]`)
    if (o !== 0 && o !== 1) throw new Error(`outcome ${k} is ${o}, expected 0 or 1`)
    score += (p - o) * (p - o)
    events += o
    const g = groups.get(p)
    if (g) { g.count++; g.events += o } else groups.set(p, { count: 1, events: o })
  }
  const baseRate = events / m
  let reliability = 0, resolution = 0
  const bins: BrierBin[] = []
  for (const [p, g] of [...groups].sort((a, b) => a[0] - b[0])) {
    const freq = g.events / g.count
    reliability += g.count * (p - freq) * (p - freq)
    resolution += g.count * (freq - baseRate) * (freq - baseRate)
    bins.push({ probability: p, count: g.count, observedFrequency: freq })
  }
  return { score: score / m, reliability: reliability / m, resolution: resolution / m, uncertainty: baseRate * (1 - baseRate), baseRate, bins }
}
