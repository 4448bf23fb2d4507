/**
 * Likelihood wording for briefings. One scale per briefing; its bands are printed in the
 * document, and every statement carries the number and the scenario count next to the words
 * (verbal terms alone are read closer to 50 % than meant: Budescu et al. 2009).
 *
 * Band rule: a probability p belongs to the band with lower ≤ p < upper; the last band also
 * takes p = 1. The scales below are Tessera's own.
 */

export const LIKELIHOOD_SCALE_KEYS = ['five-band', 'three-band'] as const
export type LikelihoodScaleKey = (typeof LIKELIHOOD_SCALE_KEYS)[number]

export interface LikelihoodBand {
  /** Words used in statements, lower case ("unlikely but possible"). */
  words: string
  /** Probability bounds in [0, 1]: lower inclusive, upper exclusive (1 inclusive for the last band). */
  lower: number
  upper: number
}

export interface LikelihoodScale {
  key: LikelihoodScaleKey
  name: string
  description: string
  bands: readonly LikelihoodBand[]
}

export const LIKELIHOOD_SCALES: Record<LikelihoodScaleKey, LikelihoodScale> = {
  'five-band': {
    key: 'five-band',
    name: 'Five bands',
    description: 'For most briefings: separates rare outcomes from ones worth planning for.',
    bands: [
      { words: 'very unlikely', lower: 0, upper: 0.1 },
      { words: 'unlikely but possible', lower: 0.1, upper: 0.35 },
      { words: 'roughly even chance', lower: 0.35, upper: 0.65 },
      { words: 'likely', lower: 0.65, upper: 0.9 },
      { words: 'very likely', lower: 0.9, upper: 1 },
    ],
  },
  'three-band': {
    key: 'three-band',
    name: 'Three bands',
    description: 'For audiences who act on a simple low / medium / high split.',
    bands: [
      { words: 'low chance', lower: 0, upper: 0.2 },
      { words: 'medium chance', lower: 0.2, upper: 0.6 },
      { words: 'high chance', lower: 0.6, upper: 1 },
    ],
  },
}

export const DEFAULT_LIKELIHOOD_SCALE: LikelihoodScaleKey = 'five-band'

export function isLikelihoodScaleKey(value: unknown): value is LikelihoodScaleKey {
  return typeof value === 'string' && (LIKELIHOOD_SCALE_KEYS as readonly string[]).includes(value)
}

/** The band of probability p ∈ [0, 1] (throws outside that range or for NaN). */
export function likelihoodBand(scale: LikelihoodScale, p: number): LikelihoodBand {
  if (!(p >= 0 && p <= 1)) throw new Error(`a probability must lie in [0, 1], got ${p}`)
  const bands = scale.bands
  for (let k = 0; k < bands.length - 1; k++) if (p < bands[k]!.upper) return bands[k]!
  return bands[bands.length - 1]!
}

/** A percentage as printed: whole percent, but never rounded to 0 % or 100 % unless it is exactly that. */
export function formatPercent(p: number): string {
  if (!(p >= 0 && p <= 1)) throw new Error(`a probability must lie in [0, 1], got ${p}`)
  if (p === 0) return '0 %'
  if (p === 1) return '100 %'
  if (p < 0.005) return 'under 1 %'
  if (p > 0.995) return 'over 99 %'
  return `${Math.round(p * 100)} %`
}

/** "10–35 %" for a band; the last band reads "90–100 %". */
export function bandRangeText(band: LikelihoodBand): string {
  return `${Math.round(band.lower * 100)}–${Math.round(band.upper * 100)} %`
}

/** How the band rule reads in the document's legend. */
export function bandRuleText(scale: LikelihoodScale): string {
  return `${scale.name}: ${scale.bands.map((b) => `${b.words} ${bandRangeText(b)}`).join('; ')}. A value on a boundary belongs to the higher band.`
}

export type StatementKind = 'anywhere' | 'areaMean' | 'fraction'
export const STATEMENT_KINDS: readonly StatementKind[] = ['anywhere', 'areaMean', 'fraction']

export const STATEMENT_KIND_LABELS: Record<StatementKind, string> = {
  anywhere: 'Anywhere in the area',
  areaMean: 'Area average',
  fraction: 'Share of the area',
}

/** The numbers a statement is made of; all computed from the joint samples, never typed in. */
export interface StatementFacts {
  kind: StatementKind
  /** P(event) for anywhere / areaMean; the expected share of the area in [0, 1] for fraction. */
  value: number
  /** Scenarios showing the event (k of N) for anywhere / areaMean; null for fraction. */
  count: number | null
  /** N: every downscaled sample of every member (members × samples per member). */
  scenarios: number
  /** M: members the scenarios come from. */
  members: number
  /** Members with at least one scenario showing the event; null when not defined (fraction). */
  membersShowing: number | null
  /** "gusts reach 20 m/s or more" (inclusive threshold, as computed). */
  event: string
  areaName: string
  /** "at 12 UTC 14 Nov 2031" / "at one or more of …": when it refers to, UTC. */
  when: string
}

function checkFacts(f: StatementFacts): void {
  if (!(f.scenarios >= 1) || !Number.isInteger(f.scenarios)) throw new Error(`scenario count must be a positive integer, got ${f.scenarios}`)
  if (f.kind !== 'fraction') {
    if (f.count == null || !Number.isInteger(f.count) || f.count < 0 || f.count > f.scenarios) throw new Error(`count must be an integer in [0, ${f.scenarios}], got ${f.count}`)
    if (Math.abs(f.count / f.scenarios - f.value) > 1e-9) throw new Error(`probability ${f.value} does not equal ${f.count}/${f.scenarios}`)
  }
}

/** "3 of 12 scenarios, from 2 of 4 members" (or "none of 12 scenarios"). */
export function scenarioCountText(f: Pick<StatementFacts, 'count' | 'scenarios' | 'members' | 'membersShowing'>): string {
  if (f.count == null) return `mean over ${f.scenarios} scenarios from ${f.members} members`
  const plural = f.scenarios === 1 ? 'scenario' : 'scenarios'
  if (f.count === 0) return `none of ${f.scenarios} ${plural}`
  const base = `${f.count} of ${f.scenarios} ${plural}`
  return f.membersShowing == null ? base : `${base}, from ${f.membersShowing} of ${f.members} members`
}

/** Words for an expected share of an area (not a probability: no likelihood band applies). */
export function shareWords(share: number): string {
  if (!(share >= 0 && share <= 1)) throw new Error(`a share must lie in [0, 1], got ${share}`)
  if (share === 0) return 'none of the area'
  if (share < 0.1) return 'small patches'
  if (share < 0.4) return 'parts of the area'
  if (share < 0.75) return 'much of the area'
  return 'most of the area'
}

/** The words that go with a statement's number: the likelihood band, or the share words for fractions. */
export function statementWords(scale: LikelihoodScale, f: Pick<StatementFacts, 'kind' | 'value'>): string {
  return f.kind === 'fraction' ? shareWords(f.value) : likelihoodBand(scale, f.value).words
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1)
}

/**
 * The generated wording of a key statement, words first and the number right after, e.g.
 * "Unlikely but possible (25 %, 3 of 12 scenarios, from 2 of 4 members) that gusts reach
 * 20 m/s or more somewhere in Kaldor Pass at 12 UTC 14 Nov 2031."
 */
export function statementSentence(scale: LikelihoodScale, f: StatementFacts): string {
  checkFacts(f)
  const number = `${formatPercent(f.value)}, ${scenarioCountText(f)}`
  const words = statementWords(scale, f)
  switch (f.kind) {
    case 'anywhere':
      return `${capitalise(words)} (${number}) that ${f.event} somewhere in ${f.areaName} ${f.when}.`
    case 'areaMean':
      return `${capitalise(words)} (${number}) that, averaged over ${f.areaName}, ${f.event} ${f.when}.`
    case 'fraction':
      return `Expected share of ${f.areaName} where ${f.event} ${f.when}: ${formatPercent(f.value)} (${words}; ${scenarioCountText(f)}).`
  }
}

/** The number as printed in the statements table, always from the computed value. */
export function statementNumberText(f: Pick<StatementFacts, 'kind' | 'value' | 'count' | 'scenarios' | 'members' | 'membersShowing'>): string {
  return `${formatPercent(f.value)} (${scenarioCountText(f)})`
}

/**
 * Checks that edited wording does not state a different number: every "N %" must be the computed
 * percentage (or a bound of the scale's bands), every "k of N" the scenario or member count.
 * Returns the problem in words, or null when the wording is consistent.
 */
export function wordingNumberProblem(text: string, scale: LikelihoodScale, f: Pick<StatementFacts, 'value' | 'count' | 'scenarios' | 'members' | 'membersShowing'>): string | null {
  const computed = Math.round(f.value * 100)
  const allowedPercents = new Set([computed, ...scale.bands.flatMap((b) => [Math.round(b.lower * 100), Math.round(b.upper * 100)])])
  if (f.value > 0 && f.value < 0.005) allowedPercents.add(1)
  if (f.value < 1 && f.value > 0.995) allowedPercents.add(99)
  for (const m of text.matchAll(/(\d+(?:[.,]\d+)?)\s*(?:%|per\s?cent)/gi)) {
    const stated = Number(m[1]!.replace(',', '.'))
    if (!allowedPercents.has(stated)) return `The wording says ${m[0]}, but the computed value is ${formatPercent(f.value)}. Numbers come from the run and cannot be changed; edit the words only.`
  }
  const pairs = new Set([`${f.count ?? ''}/${f.scenarios}`, `${f.membersShowing ?? ''}/${f.members}`])
  for (const m of text.matchAll(/(\d+)\s+(?:out\s+)?of\s+(\d+)/gi)) {
    if (!pairs.has(`${m[1]}/${m[2]}`)) return `The wording says “${m[0]}”, but the computed count is ${scenarioCountText(f)}. Counts come from the run and cannot be changed.`
  }
  return null
}
