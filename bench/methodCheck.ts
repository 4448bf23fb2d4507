/**
 * Method check on the invented 256×256 demo truth with known covariance, at block factors 8 and 4,
 * 20 samples, 3 percentile thresholds and 7 neighbourhoods (the page's defaults): total time and the
 * share of each stage (fit, mean, samples, posterior std, baselines, scoring, spectra), read from the
 * progress callback's timestamps.
 */
import { synthesiseDemoTruths } from '../shared/demo/truthFields'
import { runMethodCheck } from '../shared/numerics/pipeline/methodCheck'
import { METHOD_CHECK_DEFAULTS } from '../shared/numerics/pipeline/methodCheckReport'

export async function bench(): Promise<Record<string, number | string | boolean>> {
  const truth = synthesiseDemoTruths().find((t) => t.key === 'synthetic-matern32')!
  const out: Record<string, number | string | boolean> = {}
  const rows: string[] = []
  for (const factor of [8, 4]) {
    const marks: [string, number][] = []
    const t0 = performance.now()
    const report = runMethodCheck({
      truth: truth.values, nx: truth.nx, ny: truth.ny, spacingKm: 2.6, settings: {
        factor, kernel: 'auto', samples: 20, seed: 1,
        thresholds: { ...METHOD_CHECK_DEFAULTS.thresholds, values: [...METHOD_CHECK_DEFAULTS.thresholds.values] },
        neighbourhoods: [...METHOD_CHECK_DEFAULTS.neighbourhoods],
      },
    }, (_, stage) => marks.push([stage, performance.now() - t0]))
    const total = performance.now() - t0
    out[`check_b${factor}_ms`] = Math.round(total)
    const shares = marks.slice(0, -1).map(([stage, at], k) => [stage, (marks[k + 1]![1] - at) / total] as const)
    for (const [stage, share] of shares) {
      const key = stage.replace(/^drawing \d+ /, '').replace(/ (the|to|of)\b.*$/, '').replace(/[^a-z]+/gi, '_')
      rows.push(`b=${factor}  ${stage.padEnd(40)} ${(100 * share).toFixed(1).padStart(5)} %`)
      out[`check_b${factor}_share_${key}`] = Number(share.toFixed(3))
    }
    out[`check_b${factor}_kernel`] = report.fit.kernel
    out[`check_b${factor}_mean_beats_best_baseline_on_mse`] = report.headline.rmseMean < report.headline.rmseBestBaseline
  }
  process.stdout.write(`method check, 256×256 synthetic truth, 20 samples\n${rows.join('\n')}\n` +
    `total: b=8 ${out.check_b8_ms} ms, b=4 ${out.check_b4_ms} ms\n`)
  return out
}
