/**
 * Cost of the engine extensions of issue 8, part 2 (non-Gaussian variables, coherence in time),
 * each as a ratio to the basic model measured back to back in one run:
 *  - one member, 10 samples, full pipeline (fit + sampling + any restoration), Matérn-3/2, b = 8, at
 *    512² and 1024² fine: Box–Cox and the censored latent Gaussian against the plain Gaussian treatment
 *    of the same field; time-coherent noise at the 4th lead (4 innovations) against seeded noise.
 *    The censored model's change-of-support correction: with it (default) over without ('coarse'), on the
 *    rain field above (the correction falls back there) and on rain made of exact block means of a fine
 *    field (the correction applies). Median of the per-pair ratios.
 *  - the dry fraction of censored-model samples against synthetic truths (λ fitted / set);
 *  - the demo scenario (bench/demo.ts's run, same pool of threads) with every extension on (transform
 *    'auto' by CF name, time-coherent noise with τ fitted from the coarse members) against the basic
 *    settings, lead by lead in A-B-B-A order. Size from TESSERA_EXT2_DEMO: 'full', 'small' (default)
 *    or 'off'; TESSERA_EXT2_MEMBERS=off skips the single-member cases.
 * Run: npx tsx -e "import('./bench/extensions2.ts').then(m=>m.bench())"
 */
import { availableParallelism } from 'node:os'
import { synthesiseDemoEnsembles, type DemoEnsemble } from '../shared/demo/synthesise'
import { fitTimeScale } from '../shared/numerics/coherence/fitTimeScale'
import { blockMeans, createDownscaler } from '../shared/numerics/grf/downscaler'
import { memberNoiseSeed, sampleMember, taskSeed, type DownscaleMemberInput, type DownscaleMemberOutput } from '../shared/numerics/pipeline/downscaleMember'
import { inverseBoxCox } from '../shared/numerics/transform/boxCox'
import { censoredToPhysical } from '../shared/numerics/transform/censoredPower'
import type { TransformSummary } from '../shared/numerics/transform/latentCoarse'
import type { PhysicalMeanReport } from '../shared/numerics/transform/physicalBlockMeans'
import { DEMO_SIZES } from '../scripts/lib/demoRuns'
import { ThreadPool } from '../worker/threadPool'

type Figures = Record<string, number | string | boolean>

const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); return s[Math.floor(s.length / 2)]! }
const round = (v: number, digits = 2) => +v.toFixed(digits)

function timed<T>(fn: () => T): [T, number] {
  const t = performance.now()
  const v = fn()
  return [v, performance.now() - t]
}

/** A smooth random coarse field (zero mean, unit variance, ℓ = 3 coarse cells) from the engine itself. */
function coarseGaussian(side: number, seed: number): Float64Array {
  const d = createDownscaler({ coarse: new Float64Array((side / 2) ** 2), nx: side / 2, ny: side / 2, factor: 2, kernel: { kernel: 'matern32', lengthScale: 3, variance: 1 }, mean: 0 })
  return d.unconditional(seed, 0)
}

function memberCase(side: number, repeats: number, out: Figures): void {
  const b = 8, label = `${side * b}`
  const u = coarseGaussian(side, 11)
  const gust = u.map((v) => inverseBoxCox(2.6 + 0.35 * v, 0.3))
  const rain = u.map((v) => censoredToPhysical(v + 0.2, 0.7))
  // Rain as exact block means of a fine censored field: the change-of-support correction applies
  // (on `rain` above, pointwise on the coarse grid, it finds no fine λ in range and falls back).
  const fineRain = createDownscaler({ coarse: new Float64Array(side * side), nx: side, ny: side, factor: b, kernel: { kernel: 'matern32', lengthScale: 3 * b, variance: 1 }, mean: 0 })
    .unconditional(12, 0).map((v) => censoredToPhysical(v + 0.2, 0.7))
  const rainBlocks = blockMeans(fineRain, side * b, side, side, b)
  const base: DownscaleMemberInput = { coarse: gust, nx: side, ny: side, factor: b, kernel: 'matern32', samples: 10, seed: 3, spacingKm: 8, transform: 'none' }
  const coherence = { leadIndex: 3, leadHours: [0, 6, 12, 18], timeScaleHours: 12, noiseSeed: 5 }
  const ratios: Record<string, number[]> = { boxcox: [], censored: [], censoredIndirectOverCoarse: [], blockRainIndirectOverCoarse: [], coherence: [] }
  let blockLambda: TransformSummary | undefined
  let basicMs = 0, boxReport: PhysicalMeanReport | undefined, rainReport: PhysicalMeanReport | undefined
  for (let r = 0; r < repeats; r++) {
    const [, tBasicGust] = timed(() => sampleMember(base))
    const [box, tBox] = timed(() => sampleMember({ ...base, transform: 'boxcox' }))
    const [, tBasicRain] = timed(() => sampleMember({ ...base, coarse: rain }))
    const [cens, tCens] = timed(() => sampleMember({ ...base, coarse: rain, transform: 'censored' }))
    // With and without the correction in alternating order (A-B, then B-A), so neither always runs first.
    const pair = (coarse: Float64Array) => {
      const run = (support: 'indirect' | 'coarse') => timed(() => sampleMember({ ...base, coarse, transform: 'censored', censoredSupport: support }))
      let indirect: ReturnType<typeof run>, coarseFit: ReturnType<typeof run>
      if (r % 2 === 0) { indirect = run('indirect'); coarseFit = run('coarse') } else { coarseFit = run('coarse'); indirect = run('indirect') }
      return { out: indirect[0], ratio: indirect[1] / coarseFit[1] }
    }
    const pointwise = pair(rain), blocks = pair(rainBlocks)
    blockLambda = blocks.out.fit.transform
    const [, tBasic2] = timed(() => sampleMember(base))
    const [, tCoh] = timed(() => sampleMember({ ...base, timeCoherence: coherence }))
    ratios.boxcox!.push(tBox / tBasicGust); ratios.censored!.push(tCens / tBasicRain); ratios.censoredIndirectOverCoarse!.push(pointwise.ratio); ratios.blockRainIndirectOverCoarse!.push(blocks.ratio); ratios.coherence!.push(tCoh / tBasic2)
    basicMs = tBasicGust
    boxReport = box.diagnostics.physicalMeans as PhysicalMeanReport
    rainReport = cens.diagnostics.physicalMeans as PhysicalMeanReport
  }
  out[`${label}_basicMemberSeconds`] = round(basicMs / 1000)
  for (const [k, v] of Object.entries(ratios)) out[`${label}_${k}Ratio`] = round(median(v))
  out[`${label}_boxcoxRounds`] = boxReport!.iterations
  out[`${label}_boxcoxMaxShiftInScale`] = round(boxReport!.maxShiftInScale, 4)
  out[`${label}_boxcoxRmsShiftInScale`] = round(boxReport!.rmsShiftInScale, 4)
  out[`${label}_blockRainLambda`] = `${round(blockLambda!.lambda, 3)} (${blockLambda!.lambdaMethod}; coarse ${round(blockLambda!.coarseLambda ?? NaN, 3)})`
  out[`${label}_censoredRounds`] = rainReport!.iterations
  out[`${label}_censoredRmsShiftInScale`] = round(rainReport!.rmsShiftInScale, 4)
  out[`${label}_censoredMaxShiftInScale`] = round(rainReport!.maxShiftInScale, 4)
  out[`${label}_worstPhysicalRelativeError`] = Math.max(boxReport!.finalRelativeError, rainReport!.finalRelativeError)
}

/**
 * Dry-fraction calibration on synthetic truths from the censored model itself (latent Matérn-3/2,
 * ℓ = 6 fine cells, σ = 1, μ = 0.3, λ = 0.7; 16×16 coarse, b = 4): mean over 10 truths of (samples' dry
 * fraction − truth's), with λ fitted and corrected for the change of support (the default), λ fitted on
 * the block values as they are (censoredSupport 'coarse', the earlier default), and λ set to the truth.
 * Also the mean λ used in each case.
 */
function dryFractionCase(out: Figures): void {
  const nx = 16, b = 4
  const truth = createDownscaler({ coarse: new Float64Array(nx * nx), nx, ny: nx, factor: b, kernel: { kernel: 'matern32', lengthScale: 6, variance: 1 }, mean: 0 })
  const dry = (f: ArrayLike<number>) => { let n = 0; for (let k = 0; k < f.length; k++) if (f[k] === 0) n++; return n / f.length }
  const cases = [['fittedLambda', undefined, 'indirect'], ['fittedLambdaCoarseSupport', undefined, 'coarse'], ['trueLambda', 0.7, 'indirect']] as const
  for (const [label, lambda, support] of cases) {
    const d: number[] = []
    let lambdaSum = 0
    for (let r = 0; r < 10; r++) {
      const x = truth.unconditional(101, r).map((v) => censoredToPhysical(v + 0.3, 0.7))
      const y = blockMeans(x, nx * b, nx, nx, b)
      const o = sampleMember({ coarse: y, nx, ny: nx, factor: b, kernel: 'matern32', samples: 8, seed: 50 + r, spacingKm: 4, transform: 'censored', transformLambda: lambda, censoredSupport: support })
      lambdaSum += o.fit.transform.lambda
      d.push(o.samples.reduce((a, s) => a + dry(s), 0) / o.samples.length - dry(x))
    }
    const mean = d.reduce((a, v) => a + v, 0) / d.length
    out[`dryFractionBias_${label}`] = round(mean, 3)
    out[`dryFractionBiasSe_${label}`] = round(Math.sqrt(d.reduce((a, v) => a + (v - mean) ** 2, 0) / (d.length - 1) / d.length), 3)
    out[`dryFractionMeanLambda_${label}`] = round(lambdaSum / d.length, 3)
  }
}

/** Inputs of every task of one demo ensemble, basic or with the extensions. */
function demoInputs(e: DemoEnsemble, factor: number, samples: number, extended: boolean, tau: number): DownscaleMemberInput[] {
  return e.fields.map((coarse, k) => {
    const lead = Math.floor(k / e.members), member = k % e.members
    const input: DownscaleMemberInput = { coarse, nx: e.nx, ny: e.ny, factor, kernel: 'auto', samples, seed: taskSeed(1, lead, member), spacingKm: 10 }
    if (!extended) return input
    return { ...input, standardName: e.standardName, transform: 'auto', timeCoherence: { leadIndex: lead, leadHours: e.forecastPeriodsHours, timeScaleHours: tau, noiseSeed: memberNoiseSeed(1, member) } }
  })
}

async function demoCase(sizeName: 'full' | 'small', out: Figures): Promise<void> {
  const size = DEMO_SIZES[sizeName]
  const ensembles = synthesiseDemoEnsembles({ members: size.members, leadTimes: size.leadTimes })
  const pool = new ThreadPool(Math.max(1, availableParallelism()))
  let basic = 0, extended = 0, worst = 0
  const run = async (inputs: DownscaleMemberInput[]): Promise<[DownscaleMemberOutput[], number]> => {
    const t = performance.now()
    const outputs = await Promise.all(inputs.map((i) => pool.run(i)))
    return [outputs, (performance.now() - t) / 1000]
  }
  for (const e of ensembles) {
    const byLead = Array.from({ length: e.leadTimes.length }, (_, t) => e.fields.slice(t * e.members, (t + 1) * e.members))
    const tau = fitTimeScale(byLead, e.forecastPeriodsHours).timeScaleHours
    const plain = demoInputs(e, size.factor, size.samplesPerMember, false, tau), ext = demoInputs(e, size.factor, size.samplesPerMember, true, tau)
    let tb = 0, te = 0, cappedBasic = 0, cappedExtended = 0
    // One lead's members at a time, basic and extended back to back in A-B-B-A order, so load that
    // changes during the run falls on both alike.
    for (let t = 0; t < e.leadTimes.length; t++) {
      const lead = (inputs: DownscaleMemberInput[]) => inputs.slice(t * e.members, (t + 1) * e.members)
      const order = t % 2 === 0 ? [false, true] : [true, false]
      for (const isExtended of order) {
        const [outs, seconds] = await run(lead(isExtended ? ext : plain))
        const capped = outs.filter((o) => o.fit.atBound === 'upper').length
        if (isExtended) {
          te += seconds; cappedExtended += capped
          for (const o of outs) worst = Math.max(worst, o.blockMeanError)
          out[`demo_${e.variable}_transform`] = outs[0]!.fit.transform.name
        } else { tb += seconds; cappedBasic += capped }
      }
    }
    basic += tb; extended += te
    out[`demo_${e.variable}_tauHours`] = round(tau, 1)
    out[`demo_${e.variable}_ratio`] = round(te / tb)
    // Members whose ℓ̂ reached the cap (largest torus, slowest sampling), basic / extended.
    out[`demo_${e.variable}_atLengthScaleCap`] = `${cappedBasic} / ${cappedExtended}`
  }
  await pool.close()
  out.demoSize = sizeName
  out.demoBasicSeconds = round(basic, 1)
  out.demoExtendedSeconds = round(extended, 1)
  out.demoExtendedRatio = round(extended / basic)
  out.demoWorstBlockMeanError = worst
}

export async function bench(): Promise<Figures> {
  const figures: Figures = {}
  if (process.env.TESSERA_EXT2_MEMBERS !== 'off') {
    memberCase(64, 5, figures)
    memberCase(128, 3, figures)
    dryFractionCase(figures)
  }
  const demo = (process.env.TESSERA_EXT2_DEMO ?? 'small') as 'full' | 'small' | 'off'
  if (demo !== 'off') await demoCase(demo, figures)
  console.table(figures)
  return figures
}
