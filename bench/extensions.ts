/**
 * Engine extensions of issue 8, part 1 (geometric anisotropy, changing regimes): what they cost and what
 * they gain, all measured in one run.
 *  - Cost: one member through the full pipeline (pipeline/downscaleMember.ts: fit + 10 conditional samples),
 *    Matérn-3/2, b = 8, at 512² and 1024² fine, each extension against the basic model on the same field,
 *    timed back to back (basic, extension, basic, …; median of the per-pair ratios). Fields (invented, drawn
 *    by the engine on the coarse grid): anisotropic (ℓ₁ = 3 coarse cells, ratio 0.4, θ = 30°) for
 *    anisotropy 'fit'; two regimes (ℓ = 1 coarse cell left, 4 right) for regimes 'windows'; and an isotropic
 *    stationary field for both, where neither extension should be used (cost of the check alone).
 *  - Gain, changing regimes: the two-regime scenario of tests/numerics/extensions/regimeScenario.ts at the
 *    test's configuration over 10 seeds (the runs the test thresholds come from), its stationary control, and
 *    two 512² cases (3 seeds): ℓ = 1 and 4 coarse cells, and the test's shape scaled up (ℓ = 0.5 and 3 coarse
 *    cells): spectrum error and ensemble FSS per half, windowed vs stationary.
 *  - Gain, anisotropy: anisotropic truths (128² fine, b = 4; 5 seeds) downscaled with anisotropy 'off' and
 *    'fit': ensemble FSS and a direction-resolved spectrum error (mean |ln S̄/S_truth| over rings × four 45°
 *    sectors of wave direction); isotropic control.
 * Run: npx tsx -e "import('./bench/extensions.ts').then(m=>m.bench())"
 * Set TESSERA_EXT1_LARGE=off to skip the 1024² cost case, TESSERA_EXT1_COST=off to skip every cost case.
 */
import { createDownscaler } from '../shared/numerics/grf/downscaler'
import type { KernelParams } from '../shared/numerics/grf/kernels'
import { blockAverage } from '../shared/numerics/interp/blockAverage'
import { sampleMember, type DownscaleMemberInput } from '../shared/numerics/pipeline/downscaleMember'
import { fractionsSkill } from '../shared/numerics/verify/fractionsSkillScore'
import { periodogram, signedIndex } from '../shared/numerics/verify/periodogram'
import { ringIndex } from '../shared/numerics/verify/radialSpectrum'
import { runRegimeCase, type RegimeCase, type RegimeOutcome } from '../tests/numerics/extensions/regimeScenario'

type Figures = Record<string, number | string | boolean>

const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); return s[Math.floor(s.length / 2)]! }
const mean = (xs: number[]) => xs.reduce((s, v) => s + v, 0) / xs.length
const round = (v: number, digits = 3) => +v.toFixed(digits)

function timed<T>(fn: () => T): [T, number] {
  const t = performance.now()
  const v = fn()
  return [v, performance.now() - t]
}

/** A coarse field drawn by the engine at coarse resolution (factor 2 on half the side, so fine = coarse). */
function coarseDraw(side: number, kernel: KernelParams, seed: number): Float64Array {
  const d = createDownscaler({ coarse: new Float64Array((side / 2) ** 2), nx: side / 2, ny: side / 2, factor: 2, kernel, mean: 0 })
  return d.unconditional(seed, 0)
}

/** Two regimes at coarse resolution: ℓ = 1 cell on the left, 4 on the right, blended over the middle eighth. */
function twoRegimeCoarse(side: number, seed: number): Float64Array {
  const a = coarseDraw(side, { kernel: 'matern32', lengthScale: 1, variance: 1 }, seed)
  const c = coarseDraw(side, { kernel: 'matern32', lengthScale: 4, variance: 1 }, seed + 1)
  const band = side / 8
  return a.map((v, k) => {
    const t = Math.min(1, Math.max(0, ((k % side) + 0.5 - (side - band) / 2) / band))
    return 10 + Math.cos((t * Math.PI) / 2) * v + Math.sin((t * Math.PI) / 2) * c[k]!
  })
}

function costCase(side: number, repeats: number, out: Figures, rows: string[]): void {
  const b = 8, label = `${side * b}`
  const base = { nx: side, ny: side, factor: b, kernel: 'matern32' as const, samples: 10, seed: 3, spacingKm: 8, transform: 'none' as const }
  const fields = {
    anisotropic: coarseDraw(side, { kernel: 'matern32', lengthScale: 3, variance: 1, anisotropy: { ratio: 0.4, angle: Math.PI / 6 } }, 21).map((v) => v + 10),
    regimes: twoRegimeCoarse(side, 31),
    stationary: coarseDraw(side, { kernel: 'matern32', lengthScale: 2, variance: 1 }, 41).map((v) => v + 10),
  }
  const cases: { key: string; field: keyof typeof fields; extra: Partial<DownscaleMemberInput> }[] = [
    { key: 'anisotropyFit', field: 'anisotropic', extra: { anisotropy: 'fit' } },
    { key: 'regimesWindows', field: 'regimes', extra: { regimes: 'windows' } },
    { key: 'anisotropyOnStationary', field: 'stationary', extra: { anisotropy: 'fit' } },
    { key: 'regimesOnStationary', field: 'stationary', extra: { regimes: 'windows' } },
  ]
  for (const c of cases) {
    const ratios: number[] = [], basics: number[] = [], exts: number[] = []
    let note = ''
    for (let r = 0; r < repeats; r++) {
      const input: DownscaleMemberInput = { ...base, coarse: fields[c.field] }
      const [, tBasic] = timed(() => sampleMember(input))
      const [res, tExt] = timed(() => sampleMember({ ...input, ...c.extra }))
      ratios.push(tExt / tBasic); basics.push(tBasic); exts.push(tExt)
      const a = res.fit.anisotropy, g = res.fit.regimes
      note = a ? `adopted ${a.adopted}, ratio ${a.ratio.toFixed(2)}, θ ${a.angleDegrees.toFixed(1)}°, ${a.evaluations} shape evaluations`
        : g ? `used ${g.used}, ${g.departures}/${g.windows.length} windows depart, ℓ ${g.windows.map((w) => w.lengthScale.toFixed(0)).join('/')} fine cells`
          : ''
    }
    out[`${label}_${c.key}Ratio`] = round(median(ratios), 2)
    out[`${label}_${c.key}BasicSeconds`] = round(median(basics) / 1000, 2)
    out[`${label}_${c.key}Seconds`] = round(median(exts) / 1000, 2)
    rows.push(`  ${label}² ${c.key.padEnd(24)} ${(median(exts) / 1000).toFixed(2).padStart(7)} s vs basic ${(median(basics) / 1000).toFixed(2).padStart(6)} s  ×${median(ratios).toFixed(2)}  (${note})`)
  }
}

function regimeStudy(c: RegimeCase, seeds: number[], key: string, out: Figures, rows: string[]): void {
  const outcomes: RegimeOutcome[] = seeds.map((s) => runRegimeCase(c, s))
  const figure = (name: string, f: (o: RegimeOutcome) => number) => {
    const v = outcomes.map(f)
    out[`${key}_${name}Mean`] = round(mean(v), 4)
    out[`${key}_${name}Worst`] = round(name.startsWith('spectrumRatio') ? Math.max(...v) : Math.min(...v), 4)
    return `${name} mean ${mean(v).toFixed(3)} (worst ${(name.startsWith('spectrumRatio') ? Math.max(...v) : Math.min(...v)).toFixed(3)})`
  }
  rows.push(`  ${key}: ${c.n}×${c.n} coarse, b = ${c.factor}, ℓ ${c.shortLength}/${c.longLength} fine, ${c.samples} samples, seeds ${seeds.join(', ')}${c.stationary ? ' (stationary control: short ℓ everywhere)' : ''}`)
  for (const half of ['left', 'right'] as const) {
    const st = outcomes.map((o) => o.stationary[half]), wi = outcomes.map((o) => o.windowed[half])
    rows.push(`    ${half.padEnd(5)} spectrum error ${mean(st.map((s) => s.spectrumError)).toFixed(3)} → ${mean(wi.map((s) => s.spectrumError)).toFixed(3)}; `
      + `FSS(b+1) ${mean(st.map((s) => s.fssOne)).toFixed(3)} → ${mean(wi.map((s) => s.fssOne)).toFixed(3)}; FSS(2b+1) ${mean(st.map((s) => s.fssTwo)).toFixed(3)} → ${mean(wi.map((s) => s.fssTwo)).toFixed(3)}`)
    rows.push(`          ${figure(`spectrumRatio_${half}`, (o) => o.windowed[half].spectrumError / o.stationary[half].spectrumError)}; `
      + `${figure(`fssOneGain_${half}`, (o) => o.windowed[half].fssOne - o.stationary[half].fssOne)}; ${figure(`fssTwoGain_${half}`, (o) => o.windowed[half].fssTwo - o.stationary[half].fssTwo)}`)
  }
  const departures = outcomes.map((o) => o.regimeFit.departures)
  out[`${key}_departures`] = departures.join('/')
  out[`${key}_windowedOverStationaryTime`] = round(median(outcomes.map((o) => o.windowedMs / o.stationaryMs)), 2)
  rows.push(`    departing windows per seed ${departures.join('/')} of ${outcomes[0]!.regimeFit.windows.length}; windowed/stationary time ×${median(outcomes.map((o) => o.windowedMs / o.stationaryMs)).toFixed(2)} (median)`)
}

/** Mean |ln(S̄/S_truth)| over (ring, 45° direction sector) bins of the 2-D periodogram (Hann window). */
function directionalSpectrumError(truth: Float64Array, samples: Float64Array[], n: number): number {
  const rings = Math.floor(n / 2)
  const bin = (field: Float64Array) => {
    const s = periodogram(field, n, n)
    const sum = new Float64Array((rings + 1) * 4), count = new Float64Array((rings + 1) * 4)
    for (let q = 0; q < n; q++) for (let p = 0; p < n; p++) {
      const kp = signedIndex(p, n), kq = signedIndex(q, n)
      const r = ringIndex(kp, kq, n, n)
      if (r < 1 || r > rings) continue
      const phi = ((Math.atan2(kq, kp) % Math.PI) + Math.PI) % Math.PI
      const sector = Math.floor(((phi + Math.PI / 8) % Math.PI) / (Math.PI / 4))
      sum[r * 4 + sector]! += s[q * n + p]!; count[r * 4 + sector]!++
    }
    return sum.map((v, k) => (count[k]! > 0 ? v / count[k]! : NaN))
  }
  const t = bin(truth), m = new Float64Array(t.length)
  for (const x of samples) bin(x).forEach((v, k) => { m[k]! += v / samples.length })
  let e = 0, c = 0
  for (let k = 0; k < t.length; k++) if (Number.isFinite(t[k]!) && t[k]! > 0) { e += Math.abs(Math.log(m[k]! / t[k]!)); c++ }
  return e / c
}

function anisotropyStudy(ratio: number, seeds: number[], key: string, out: Figures, rows: string[]): void {
  const n = 32, b = 4, N = n * b
  const d = createDownscaler({ coarse: new Float64Array(n * n), nx: n, ny: n, factor: b, kernel: { kernel: 'matern32', lengthScale: 12, variance: 1, anisotropy: { ratio, angle: Math.PI / 6 } }, mean: 0 })
  const base = { nx: n, ny: n, factor: b, kernel: 'matern32' as const, samples: 8, seed: 7, spacingKm: 4, transform: 'none' as const }
  const figures = { spectrumOff: [] as number[], spectrumFit: [] as number[], fssOneOff: [] as number[], fssOneFit: [] as number[], fssTwoOff: [] as number[], fssTwoFit: [] as number[] }
  let adopted = 0
  for (const seed of seeds) {
    const truth = d.unconditional(seed).map((v) => v + 5)
    const coarse = blockAverage(truth, N, N, b)
    const sorted = Array.from(truth).sort((p, q) => p - q)
    const threshold = sorted[Math.floor(0.9 * sorted.length)]!
    for (const option of ['off', 'fit'] as const) {
      const res = sampleMember({ ...base, coarse, anisotropy: option })
      if (option === 'fit' && res.fit.anisotropy?.adopted) adopted++
      const fss = fractionsSkill(truth, { nx: N, ny: N, members: res.samples }, threshold, [b + 1, 2 * b + 1]).fss
      const suffix = option === 'off' ? 'Off' : 'Fit'
      figures[`spectrum${suffix}`].push(directionalSpectrumError(truth, res.samples, N))
      figures[`fssOne${suffix}`].push(fss.get(b + 1)!)
      figures[`fssTwo${suffix}`].push(fss.get(2 * b + 1)!)
    }
  }
  for (const [k, v] of Object.entries(figures)) out[`${key}_${k}`] = round(mean(v), 4)
  out[`${key}_adopted`] = `${adopted}/${seeds.length}`
  rows.push(`  ${key}: truth ratio ${ratio}, θ = 30°, ℓ₁ 12 fine, 32×32 coarse, b = 4, 8 samples, seeds ${seeds.join(', ')}; anisotropy adopted ${adopted}/${seeds.length}`)
  rows.push(`    directional spectrum error ${mean(figures.spectrumOff).toFixed(3)} → ${mean(figures.spectrumFit).toFixed(3)}; FSS(b+1) ${mean(figures.fssOneOff).toFixed(3)} → ${mean(figures.fssOneFit).toFixed(3)}; FSS(2b+1) ${mean(figures.fssTwoOff).toFixed(3)} → ${mean(figures.fssTwoFit).toFixed(3)}`)
}

export async function bench(): Promise<Figures> {
  const out: Figures = {}
  const rows: string[] = []
  rows.push('cost, one member (fit + 10 samples, Matérn-3/2, b = 8), extension vs basic back to back:')
  if (process.env.TESSERA_EXT1_COST !== 'off') costCase(64, 3, out, rows)
  if (process.env.TESSERA_EXT1_COST !== 'off' && process.env.TESSERA_EXT1_LARGE !== 'off') costCase(128, 1, out, rows)
  rows.push('gain, changing regimes (windowed vs stationary; spectrum error: lower is better):')
  const seeds = [100, 200, 300, 400, 500, 600, 700, 800, 900, 1000]
  regimeStudy({ n: 32, factor: 4, shortLength: 2, longLength: 12, samples: 8 }, seeds, 'regimes128', out, rows)
  regimeStudy({ n: 32, factor: 4, shortLength: 2, longLength: 12, samples: 8, stationary: true }, seeds, 'regimes128Stationary', out, rows)
  regimeStudy({ n: 64, factor: 8, shortLength: 8, longLength: 32, samples: 8 }, [100, 200, 300], 'regimes512', out, rows)
  // The 128² scenario scaled up: the same ℓ/b in each half (0.5 and 3 coarse cells) on the 512² grid.
  regimeStudy({ n: 64, factor: 8, shortLength: 4, longLength: 24, samples: 8 }, [100, 200, 300], 'regimes512SameShape', out, rows)
  rows.push('gain, anisotropy (anisotropy fit vs off):')
  anisotropyStudy(0.4, [11, 12, 13, 14, 15], 'anisotropic', out, rows)
  anisotropyStudy(1, [11, 12, 13, 14, 15], 'isotropicControl', out, rows)
  process.stdout.write(`engine extensions, part 1: anisotropy and changing regimes\n${rows.join('\n')}\n`)
  return out
}
