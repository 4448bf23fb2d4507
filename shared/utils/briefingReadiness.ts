/**
 * What a briefing still needs before it can be submitted for approval. The builder shows the
 * list as it goes; the server checks it again on submission and refuses with the same list.
 */

export interface BriefingReadinessInput {
  title: string
  runId: number | null
  windowStart: string | Date | null
  windowEnd: string | Date | null
  selection: { areaIds: number[]; thresholds: unknown[] }
  statements: { areaId: number; included: boolean }[]
  recipients: unknown[]
  caveats: { snapshot: { standing: boolean }[] }
  narrative: { headline: string }
  contact: string
  nextUpdateAt: string | Date | null
}

export interface BriefingProblem {
  /** The part of the builder to go to: title, window, areas, statements, recipients, caveats, narrative, contact, nextUpdate. */
  field: string
  message: string
}

/** Every problem that blocks submission, in the order of the builder's sections (empty = ready). */
export function briefingReadiness(b: BriefingReadinessInput, areaNames: Record<number, string> = {}): BriefingProblem[] {
  const problems: BriefingProblem[] = []
  const add = (field: string, message: string) => problems.push({ field, message })
  if (!b.title.trim()) add('title', 'Give the briefing a title.')
  if (b.runId == null) add('window', 'The forecast run behind this briefing no longer exists; start a new briefing from a current run.')
  if (!b.windowStart || !b.windowEnd) add('window', 'Set the validity window.')
  else if (new Date(b.windowStart).getTime() > new Date(b.windowEnd).getTime()) add('window', 'The validity window ends before it starts.')
  if (b.selection.areaIds.length === 0) add('areas', 'Choose at least one area of interest.')
  if (b.selection.thresholds.length === 0) add('areas', 'Choose at least one hazard threshold.')
  for (const areaId of b.selection.areaIds) {
    if (!b.statements.some((s) => s.areaId === areaId && s.included)) {
      add('statements', `${areaNames[areaId] ?? `Area ${areaId}`} has no key statement: include at least one.`)
    }
  }
  if (b.recipients.length === 0) add('recipients', 'Choose who receives the briefing.')
  if (!b.caveats.snapshot.some((c) => c.standing)) add('caveats', 'The standing caution is missing: a duty lead must keep one standing caveat active in the library.')
  if (!b.narrative.headline.trim()) add('narrative', 'Write a headline.')
  if (!b.contact.trim()) add('contact', 'Give a contact for questions about this briefing.')
  if (!b.nextUpdateAt) add('nextUpdate', 'Say when the next update is due.')
  return problems
}
