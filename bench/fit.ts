/**
 * Covariance fit on a 128×128 coarse field (b = 8, i.e. a 1024² fine grid) with a known length scale.
 * Target: one fit in under 1 s. Reported as time, likelihood evaluations, time per evaluation, and the ratio
 * to one real FFT of the padded fine grid (1024² → 2048² torus), all measured in this run; plus the recovered
 * ℓ against the truth and the agreement of the Whittle and exact likelihoods on the same data.
 *
 * Data: se — the exact law of se block means (Kronecker square roots, tests/numerics/fit/synthetic.ts);
 * matern32 — an unconditional 1024² fine field by circulant embedding (grf/downscaler.ts), block-averaged.
 */
import { realFft2d } from '../shared/numerics/fft/fft2d'
import { fitCoarseField, type FitOptions, type FitResult } from '../shared/numerics/fit/fitCoarse'
import { createDownscaler } from '../shared/numerics/grf/downscaler'
import { blockAverage } from '../shared/numerics/interp/blockAverage'
import { coarseSampler, seKroneckerSampler } from '../tests/numerics/fit/synthetic'

const N = 128, B = 8

/** Result, wall-clock ms and CPU ms of this process (the CPU figure is immune to other load on the machine). */
function timed<T>(fn: () => T): [T, number, number] {
  const t0 = performance.now(), c0 = process.cpuUsage()
  const out = fn()
  const c = process.cpuUsage(c0)
  return [out, performance.now() - t0, (c.user + c.system) / 1000]
}

/** Median time of `repeats` runs (ms). */
function medianTime(fn: () => void, repeats: number): number {
  const t = Array.from({ length: repeats }, () => timed(fn)[1]).sort((p, q) => p - q)
  return t[Math.floor(repeats / 2)]!
}

function matern32Coarse(lengthScale: number, seed: number): Float64Array {
  const fine = N * B
  const d = createDownscaler({
    coarse: new Float64Array(N * N), nx: N, ny: N, factor: B,
    kernel: { kernel: 'matern32', lengthScale, variance: 1.5 }, mean: 0,
  })
  return blockAverage(d.unconditional(seed), fine, fine, B).map((v) => v + 7)
}

export async function bench(): Promise<Record<string, number | string | boolean>> {
  const fine = N * B
  const pad = 2 * fine
  const fftData = Float64Array.from({ length: pad * pad }, (_, k) => Math.sin(k * 0.001))
  realFft2d(fftData, pad, pad) // warm-up
  const fftMs = medianTime(() => realFft2d(fftData, pad, pad), 3)
  const fftCpuMs = timed(() => realFft2d(fftData, pad, pad))[2]

  const fit = (y: Float64Array, opts: Omit<FitOptions, 'factor'>) => timed(() => fitCoarseField(y, N, N, { factor: B, ...opts }))
  const rows: [string, string][] = []
  const out: Record<string, number | string | boolean> = { fftPadded2048Ms: fftMs, fftPadded2048CpuMs: fftCpuMs }
  const record = (key: string, r: FitResult, ms: number, truth: number, cpuMs: number) => {
    out[`${key}Ms`] = ms
    out[`${key}CpuMs`] = cpuMs
    out[`${key}Evaluations`] = r.totalEvaluations
    out[`${key}MsPerEvaluation`] = ms / r.totalEvaluations
    out[`${key}RatioToFft`] = ms / fftMs
    out[`${key}LengthScale`] = r.lengthScale
    out[`${key}Truth`] = truth
    out[`${key}Method`] = r.method
    rows.push([key, `${ms.toFixed(0)} ms (CPU ${cpuMs.toFixed(0)}), ${r.totalEvaluations} evals (${(ms / r.totalEvaluations).toFixed(1)} ms each), ${(ms / fftMs).toFixed(2)}× FFT; ${r.method}, ${r.kernel}: ℓ = ${r.lengthScale.toFixed(3)} [${r.lengthScaleInterval.map((v) => v.toFixed(2)).join(', ')}] ± ${r.standardError.toFixed(3)} vs truth ${truth}`])
  }

  // se, ℓ = 16 fine cells (2 coarse cells).
  const ySe = seKroneckerSampler(16, B, N, N, 4, 10)(2024)
  fit(ySe, { kernel: 'se' }) // warm-up of the JIT on the same path
  const [seFit, seMs, seCpu] = fit(ySe, { kernel: 'se' })
  record('se', seFit, seMs, 16, seCpu)
  const [seWhittle, seWhittleMs, seWhittleCpu] = fit(ySe, { kernel: 'se', method: 'whittle' })
  record('seWhittle', seWhittle, seWhittleMs, 16, seWhittleCpu)

  // matern32, ℓ = 24 fine cells (3 coarse cells), from a fine field.
  const [yM, genMs] = timed(() => matern32Coarse(24, 7))
  fit(yM, { kernel: 'matern32' })
  const [mFit, mMs, mCpu] = fit(yM, { kernel: 'matern32' })
  record('matern32', mFit, mMs, 24, mCpu)
  const [autoFit, autoMs, autoCpu] = fit(yM, { kernel: 'auto' })
  record('auto', autoFit, autoMs, 24, autoCpu)
  out.autoKernel = autoFit.kernel

  // Exact vs Whittle on one dataset each: se at 128² (Kronecker), matern32 at 24² (dense).
  out.seWhittleMinusExactOverSe = (seWhittle.lengthScale - seFit.lengthScale) / Math.hypot(seWhittle.standardError, seFit.standardError)
  const ySmall = coarseSampler({ kernel: 'matern32', lengthScale: 8, variance: 2, mean: 5, factor: 4, nx: 24, ny: 24 })(11)
  const [exactSmall, exactSmallMs] = timed(() => fitCoarseField(ySmall, 24, 24, { factor: 4, kernel: 'matern32', method: 'exact' }))
  const [whittleSmall, whittleSmallMs] = timed(() => fitCoarseField(ySmall, 24, 24, { factor: 4, kernel: 'matern32', method: 'whittle' }))
  out.matern32Small24ExactLengthScale = exactSmall.lengthScale
  out.matern32Small24WhittleLengthScale = whittleSmall.lengthScale
  out.matern32Small24ExactMs = exactSmallMs
  out.matern32Small24WhittleMs = whittleSmallMs
  out.matern32Small24DiffOverSe = (whittleSmall.lengthScale - exactSmall.lengthScale) / Math.hypot(whittleSmall.standardError, exactSmall.standardError)
  out.fitUnder1s = seMs < 1000 && mMs < 1000

  rows.unshift(['FFT 2048² (real)', `${fftMs.toFixed(0)} ms (CPU ${fftCpuMs.toFixed(0)})`])
  rows.push(['se: Whittle − exact', `${out.seWhittleMinusExactOverSe.toFixed(2)} combined standard errors`])
  rows.push(['matern32 24², exact vs Whittle', `ℓ ${exactSmall.lengthScale.toFixed(3)} (${exactSmallMs.toFixed(0)} ms) vs ${whittleSmall.lengthScale.toFixed(3)} (${whittleSmallMs.toFixed(0)} ms): ${out.matern32Small24DiffOverSe.toFixed(2)} combined s.e.`])
  rows.push(['matern32 data', `1024² unconditional field by circulant embedding in ${genMs.toFixed(0)} ms`])
  const width = Math.max(...rows.map(([k]) => k.length))
  for (const [k, v] of rows) console.log(`${k.padEnd(width)}  ${v}`)
  return out
}
