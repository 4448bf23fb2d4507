/**
 * Samples of a time window [from, to] of a run, as one "lead time" for the map products: for each
 * scenario (sample m of a member is the same scenario at every lead time) and fine cell, the
 * highest value over the window's lead times (for events 'above') or the lowest ('below').
 * P(x ≥ T at the cell) of that stack is P(T reached at one or more of the window's valid times);
 * NMEP and NEP of it are the "somewhere within R, at some time" forms. The window entries are
 * cached like lead times, keyed by the fingerprints of their lead times.
 */
import { createError } from 'h3'
import { ProductPlan } from '../../shared/numerics/ensemble/productPlan'
import { timeExtremeStack, type Direction } from '../../shared/numerics/ensemble/stack'
import { checkLeadIndex, leadSamples, type LeadSamples, type RunRow } from './runSamples'
import { timeCoherenceSentence, typicalLeadSpacingHours } from '../../shared/utils/timeCoherenceText'

const windowCache = new Map<string, LeadSamples>()
/** Window entries kept in memory; each holds one extra copy of a lead time's samples. */
const WINDOW_CACHE_SIZE = 2

const conflict = (message: string) => createError({ statusCode: 409, statusMessage: 'Conflict', message })

/** True when every entry holds the same members with the same number of samples each (sample m = same scenario). */
export function samplesAligned(entries: LeadSamples[]): boolean {
  const first = entries[0]!
  return entries.every((e) => e.memberIndices.join() === first.memberIndices.join() && e.sampleStart.join() === first.sampleStart.join())
}

/** What "any time in the window" counts: per scenario, and how strongly the scenarios hang together in time. */
export function windowMeaning(run: Pick<RunRow, 'settings' | 'leadTimes'>, entries: LeadSamples[]): string {
  const base = 'At one or more of the window\'s valid times, counted per scenario (sample k of a member is the same scenario at every lead time).'
  const coherent = entries.length > 0 && entries.every((e) => e.timeCoherent)
  const tau = coherent ? run.settings?.timeScaleHours ?? null : null
  const spacing = typicalLeadSpacingHours(entries.map((e) => run.leadTimes[e.leadIndex]!))
  return `${base} ${timeCoherenceSentence(tau, spacing)}`
}

/** Element-wise extreme of Float32 grids; NaN (missing coarse cell) anywhere stays NaN. */
function extremeOf(grids: Float32Array[], extreme: 'max' | 'min'): Float32Array {
  const out = Float32Array.from(grids[0]!)
  for (let t = 1; t < grids.length; t++) {
    const g = grids[t]!
    for (let k = 0; k < out.length; k++) {
      const v = g[k]!
      if (Number.isNaN(v) || Number.isNaN(out[k]!)) out[k] = NaN
      else if (extreme === 'max' ? v > out[k]! : v < out[k]!) out[k] = v
    }
  }
  return out
}

/**
 * The samples for the map products of lead `from` alone (to = from) or of the window from..to
 * (inclusive). 400 for a window that ends before it starts; 409 when a lead time of the window has
 * no samples yet or the lead times do not hold the same members and samples.
 */
export async function windowLeadSamples(run: RunRow, from: number, to: number | undefined, direction: Direction): Promise<LeadSamples> {
  if (to === undefined || to === from) return leadSamples(run, from)
  checkLeadIndex(run, from)
  checkLeadIndex(run, to)
  if (to < from) {
    throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: `The time window must end at or after its first lead time (lead ${from + 1}); it ends at lead ${to + 1}.` })
  }
  const entries: LeadSamples[] = []
  for (let l = from; l <= to; l++) entries.push(await leadSamples(run, l))
  if (!samplesAligned(entries)) {
    throw conflict(`The lead times ${from + 1} to ${to + 1} do not hold the same members and samples (some are still being downscaled or failed), so no window map can be drawn.`)
  }
  const extreme = direction === 'above' ? 'max' : 'min'
  const key = `${run.id}:${from}-${to}:${extreme}:${entries.map((e) => e.fingerprint).join('|')}`
  const hit = windowCache.get(key)
  if (hit) { windowCache.delete(key); windowCache.set(key, hit); return hit }
  const started = performance.now()
  const stack = timeExtremeStack(entries.map((e) => e.plan.stack), extreme)
  let missing: Uint8Array | null = null
  for (const e of entries) if (e.missing) { missing ??= new Uint8Array(e.missing.length); for (let k = 0; k < missing.length; k++) missing[k]! |= e.missing[k]! }
  const first = entries[0]!
  const entry: LeadSamples = {
    runId: run.id, leadIndex: from, fingerprint: key,
    plan: new ProductPlan(stack, { neighbourhoodCacheSize: 1 }),
    memberIndices: first.memberIndices, sampleStart: first.sampleStart, samplesPerMember: first.samplesPerMember,
    timeCoherent: entries.every((e) => e.timeCoherent),
    coarse: first.coarse.map((_, m) => extremeOf(entries.map((e) => e.coarse[m]!), extreme)),
    missing,
    valueRange: [Math.min(...entries.map((e) => e.valueRange[0])), Math.max(...entries.map((e) => e.valueRange[1]))],
    loadMs: Math.round(entries.reduce((s, e) => s + e.loadMs, 0) + performance.now() - started),
    maps: new Map(),
    window: { from, to, extreme, meaning: windowMeaning(run, entries) },
  }
  for (const k of windowCache.keys()) if (k.startsWith(`${run.id}:${from}-${to}:${extreme}:`)) windowCache.delete(k)
  windowCache.set(key, entry)
  while (windowCache.size > WINDOW_CACHE_SIZE) windowCache.delete(windowCache.keys().next().value!)
  return entry
}

/** Drops the cached windows of a run (with forgetRunSamples). */
export function forgetRunWindows(runId: number): void {
  for (const k of [...windowCache.keys()]) if (k.startsWith(`${runId}:`)) windowCache.delete(k)
}
