/**
 * Threshold sets per hazard. The migration seeds common-practice defaults; forecasters, duty
 * leads and administrators replace a hazard's set as a whole, audited with before and after.
 */
import type { H3Event } from 'h3'
import { asc, eq } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { HAZARD_DEFINITIONS, HAZARDS, type Hazard, type ThresholdSetInput } from '../../shared/schemas/products'
import { useDB, tables } from './db'
import { recordAudit } from './audit'

const t = tables.hazardThresholds

export interface HazardThreshold {
  id: number
  label: string
  value: number
  units: string
  direction: 'above' | 'below'
  /** True when the value is one of the common-practice defaults shipped with Tessera. */
  isDefault: boolean
  updatedAt: Date
}

export async function listHazards() {
  const rows = await useDB().select().from(t).orderBy(asc(t.hazard), asc(t.position), asc(t.value))
  return HAZARDS.map((hazard) => {
    const d = HAZARD_DEFINITIONS[hazard]
    return {
      hazard, label: d.label, units: d.units, displayUnits: d.displayUnits, direction: d.direction, standardNames: d.standardNames, note: d.note,
      defaults: d.defaults,
      thresholds: rows.filter((r) => r.hazard === hazard).map((r): HazardThreshold => ({
        id: r.id, label: r.label, value: r.value, units: r.units, direction: r.direction, isDefault: r.isDefault, updatedAt: r.updatedAt,
      })),
    }
  })
}

/** Replaces the set of one hazard; values matching a shipped default stay marked as common practice. */
export async function replaceHazardThresholds(event: H3Event, user: User, hazard: Hazard, input: ThresholdSetInput) {
  const d = HAZARD_DEFINITIONS[hazard]
  const sorted = [...input.thresholds].sort((p, q) => (d.direction === 'above' ? p.value - q.value : q.value - p.value))
  await useDB().transaction(async (tx) => {
    const before = await tx.select({ label: t.label, value: t.value }).from(t).where(eq(t.hazard, hazard)).orderBy(asc(t.position))
    await tx.delete(t).where(eq(t.hazard, hazard))
    if (sorted.length) {
      await tx.insert(t).values(sorted.map((x, position) => ({
        hazard, label: x.label, value: x.value, units: d.units, direction: d.direction, position, updatedById: user.id,
        isDefault: d.defaults.some((def) => def.value === x.value),
      })))
    }
    await recordAudit({ actor: user, action: 'hazard.thresholds', entityType: 'hazard', entityId: hazard, before, after: sorted }, event, tx)
  })
  return (await listHazards()).find((h) => h.hazard === hazard)!
}
