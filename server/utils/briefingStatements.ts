/**
 * Key statements of a briefing, computed from the run's joint samples through the workspace's
 * area products (areaProductsForRun): per area × threshold × kind over the briefing's window.
 *
 * Counting: N scenarios = every downscaled sample of every member (members × samples per member);
 * k = scenarios in which the event happens (for a window: at one or more of its valid times);
 * "members showing" = members with at least one such scenario.
 */
import type { MultiPolygon } from 'geojson'
import { areaMask } from '../../shared/numerics/ensemble/areaMask'
import { areaSamples, windowAreaSamples } from '../../shared/numerics/ensemble/areaSamples'
import type { EnsembleStack } from '../../shared/numerics/ensemble/stack'
import { LIKELIHOOD_SCALES, statementSentence, type LikelihoodScaleKey, type StatementKind } from '../../shared/utils/likelihood'
import { briefingWhenText } from '../../shared/utils/briefingTimes'
import type { BriefingMethod, BriefingSelection, BriefingStatement, BriefingThreshold } from '../../shared/schemas/briefings'
import { areaProductsForRun, areaCellsOnGrid } from './areaProducts'
import { getArea } from './areas'
import { eventPhrase } from './products'
import { leadSamples, runPlacement, type LeadSamples, type RunRow } from './runSamples'
import { getRun } from './runs'

export const statementKey = (areaId: number, t: Pick<BriefingThreshold, 'value' | 'direction'>, kind: StatementKind) =>
  `${areaId}|${t.direction}|${t.value}|${kind}`

type ProductFigures = { samples: number; members: number; anywhere: number; anywhereCount: number; areaMean: number; areaMeanCount: number; fractionExpected: number; membersAnywhere: number }

/**
 * Members with at least one scenario whose area mean crosses the threshold (at one or more lead
 * times of the window), and the number of such scenarios, from the same cells as the area products.
 */
function areaMeanMembers(entries: LeadSamples[], cells: Int32Array, threshold: number, direction: 'above' | 'below'): { scenarios: number; members: number } {
  const mask = areaMask(new Float64Array(cells.length).fill(1), cells.length, 1)
  const stacks: EnsembleStack[] = entries.map((e) => ({
    nx: cells.length, ny: 1,
    members: e.plan.stack.members.map((g) => { const out = new Float32Array(cells.length); for (let c = 0; c < cells.length; c++) out[c] = g[cells[c]!]!; return out }),
  }))
  const s = windowAreaSamples(stacks.map((st) => areaSamples(st, mask)))
  const starts = entries[0]!.sampleStart
  let scenarios = 0, members = 0
  for (let g = 0; g + 1 < starts.length; g++) {
    let any = false
    for (let m = starts[g]!; m < starts[g + 1]!; m++) {
      const crosses = direction === 'above' ? s.meanMax[m]! >= threshold : s.meanMin[m]! <= threshold
      if (crosses) { scenarios++; any = true }
    }
    if (any) members++
  }
  return { scenarios, members }
}

/** The run facts the method section prints (fitted kernels and length-scale range over members). */
export async function briefingMethodFacts(run: RunRow): Promise<BriefingMethod> {
  const { run: summary, tasks } = await getRun(run.id)
  const fits = tasks.filter((t) => t.status === 'done' && t.fit).map((t) => t.fit as {
    kernel?: string; lengthScaleKm?: number; transform?: { name?: string }; anisotropy?: { adopted?: boolean }; regimes?: { used?: boolean }
  })
  const lengths = fits.map((f) => f.lengthScaleKm).filter((v): v is number => typeof v === 'number' && Number.isFinite(v))
  const factor = run.settings!.factor
  const samplesPerMember = run.settings!.samplesPerMember
  return {
    runId: run.id, runName: run.name, referenceTime: run.referenceTime ? run.referenceTime.toISOString() : null, isDemo: run.isDemo,
    members: run.members, samplesPerMember, scenarios: run.members * samplesPerMember, factor,
    coarseSpacingKm: run.grid.spacingKm, fineSpacingKm: summary.fineSpacingKm ?? run.grid.spacingKm / factor,
    kernels: [...new Set(fits.map((f) => f.kernel).filter((k): k is string => !!k))].sort(),
    lengthScaleKm: lengths.length ? [Math.min(...lengths), Math.max(...lengths)] : null,
    quantity: run.standardName ?? run.variable, units: run.displayUnits, leadTimes: run.leadTimes,
    extensions: {
      transforms: [...new Set(fits.map((f) => f.transform?.name ?? 'none'))].sort(),
      anisotropicFits: fits.filter((f) => f.anisotropy?.adopted).length,
      regimeFits: fits.filter((f) => f.regimes?.used).length,
      fits: fits.length,
      timeScaleHours: run.settings!.timeCoherence && Number.isFinite(run.settings!.timeScaleHours) ? run.settings!.timeScaleHours! : null,
    },
  }
}

export interface ComputedStatements {
  statements: BriefingStatement[]
  /** Areas that produced no numbers (outside the grid, no samples), with the reason. */
  notes: string[]
}

/**
 * Computes every statement of the selection. Wording a person edited is kept when the numbers it
 * was written for are unchanged; otherwise the new generated sentence replaces it.
 */
export async function computeBriefingStatements(run: RunRow, selection: BriefingSelection, scaleKey: LikelihoodScaleKey,
  previous: BriefingStatement[]): Promise<ComputedStatements> {
  const scale = LIKELIHOOD_SCALES[scaleKey]
  const placement = runPlacement(run)
  const window = { from: selection.leadFrom, to: selection.leadTo }
  const when = briefingWhenText(run, selection.leadFrom, selection.leadTo)
  const before = new Map(previous.map((s) => [s.key, s]))
  const statements: BriefingStatement[] = []
  const notes: string[] = []
  // Every lead of the window must have samples (a 409 names the missing one); cells lacking coarse data
  // at any lead time with samples are left out, as the area products do.
  const windowEntries: LeadSamples[] = []
  for (let l = selection.leadFrom; l <= selection.leadTo; l++) windowEntries.push(await leadSamples(run, l))
  const missing = unionMissing(await samplesOfEveryLead(run))
  for (const areaId of selection.areaIds) {
    const area = await getArea(areaId)
    for (const threshold of selection.thresholds) {
      const result = await areaProductsForRun(run, placement, area.geometry as MultiPolygon, threshold.value, threshold.direction, window)
      const single = selection.leadFrom === selection.leadTo
      const figures: ProductFigures | null | undefined = single ? result.leads.find((x) => x.leadIndex === selection.leadFrom) : result.window
      if (!figures || result.cells === 0) {
        notes.push(`${area.name}: ${result.note ?? result.windowNote ?? 'no numbers for this window.'}`)
        continue
      }
      const cells = areaCellsOnGrid(placement, area.geometry as MultiPolygon, missing).cells
      const meanMembers = selection.kinds.includes('areaMean') ? areaMeanMembers(windowEntries, cells, threshold.value, threshold.direction) : null
      if (meanMembers && meanMembers.scenarios !== figures.areaMeanCount) {
        throw new Error(`area-mean count mismatch for area ${areaId}: ${meanMembers.scenarios} vs ${figures.areaMeanCount}`)
      }
      const event = eventPhrase(run, threshold.value, threshold.direction)
      const samplesPerMember = run.settings?.samplesPerMember ?? null
      for (const kind of selection.kinds) {
        const facts = {
          kind, scenarios: figures.samples, members: figures.members, event, areaName: area.name, when,
          value: kind === 'anywhere' ? figures.anywhere : kind === 'areaMean' ? figures.areaMean : figures.fractionExpected,
          count: kind === 'anywhere' ? figures.anywhereCount : kind === 'areaMean' ? figures.areaMeanCount : null,
          membersShowing: kind === 'anywhere' ? figures.membersAnywhere : kind === 'areaMean' ? meanMembers!.members : null,
        }
        const key = statementKey(areaId, threshold, kind)
        const generatedText = statementSentence(scale, facts)
        const old = before.get(key)
        const sameNumbers = old && old.value === facts.value && old.count === facts.count && old.scenarios === facts.scenarios && old.when === when
        statements.push({
          key, areaId, threshold, ...facts, samplesPerMember,
          cells: result.cells, note: result.note ?? null,
          generatedText,
          text: sameNumbers && old.edited ? old.text : generatedText,
          edited: sameNumbers ? old.edited : null,
          included: old ? old.included : true,
        })
      }
    }
  }
  return { statements, notes }
}

async function samplesOfEveryLead(run: RunRow): Promise<LeadSamples[]> {
  const entries: LeadSamples[] = []
  for (let l = 0; l < run.leadTimes.length; l++) {
    try { entries.push(await leadSamples(run, l)) } catch (err) {
      if ((err as { statusCode?: number }).statusCode !== 409) throw err
    }
  }
  return entries
}

/** Fine cells missing coarse data in any lead time of the window (as the area products leave them out). */
function unionMissing(entries: LeadSamples[]): Uint8Array | null {
  let missing: Uint8Array | null = null
  for (const e of entries) if (e.missing) { missing ??= new Uint8Array(e.missing.length); for (let k = 0; k < missing.length; k++) missing[k]! |= e.missing[k]! }
  return missing
}

/** Re-words statements for another likelihood scale (numbers unchanged; edited wording kept). */
export function rewordStatements(statements: BriefingStatement[], scaleKey: LikelihoodScaleKey): BriefingStatement[] {
  const scale = LIKELIHOOD_SCALES[scaleKey]
  return statements.map((s) => {
    const generatedText = statementSentence(scale, s)
    return { ...s, generatedText, text: s.edited ? s.text : generatedText }
  })
}
