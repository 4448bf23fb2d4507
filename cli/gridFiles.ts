import { readFileSync, writeFileSync } from 'node:fs'
import { UsageError } from './args'

/** A row-major grid: value of column i, row j at index j·nx + i; NaN marks a missing cell. */
export interface GridFile { nx: number; ny: number; values: Float64Array; spacing?: number }

/** Several grids of one shape, e.g. ensemble members or samples, each row-major. */
export interface MembersFile { nx: number; ny: number; members: Float64Array[] }

function readJson(path: string): unknown {
  let text: string
  try { text = readFileSync(path, 'utf8') } catch { throw new UsageError(`cannot read ${path}`) }
  try { return JSON.parse(text) } catch (err) { throw new UsageError(`${path} is not valid JSON: ${(err as Error).message}`) }
}

function dimension(obj: Record<string, unknown>, key: string, path: string): number {
  const v = obj[key]
  if (typeof v !== 'number' || !Number.isInteger(v) || v < 1) throw new UsageError(`${path}: "${key}" must be a positive integer`)
  return v
}

function toValues(raw: unknown, n: number, what: string, allowMissing: boolean): Float64Array {
  if (!Array.isArray(raw)) throw new UsageError(`${what} must be an array`)
  if (raw.length !== n) throw new UsageError(`${what} has ${raw.length} values, expected nx·ny = ${n}`)
  const out = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    const v = raw[k]
    if (v === null && allowMissing) out[k] = NaN
    else if (typeof v === 'number' && Number.isFinite(v)) out[k] = v
    else throw new UsageError(`${what}[${k}] is ${JSON.stringify(v)}: expected a finite number${allowMissing ? ' or null' : ''}`)
  }
  return out
}

/** Reads Tessera's grid JSON `{ nx, ny, values, spacing? }` (`null` = missing cell). */
export function readGridFile(path: string): GridFile {
  const obj = readJson(path)
  if (typeof obj !== 'object' || obj === null) throw new UsageError(`${path}: expected an object { nx, ny, values }`)
  const o = obj as Record<string, unknown>
  const nx = dimension(o, 'nx', path)
  const ny = dimension(o, 'ny', path)
  const values = toValues(o.values, nx * ny, `${path}: values`, true)
  const spacing = o.spacing
  if (spacing !== undefined && (typeof spacing !== 'number' || !(spacing > 0))) throw new UsageError(`${path}: "spacing" must be a positive number of km`)
  return { nx, ny, values, spacing: spacing as number | undefined }
}

/** Reads `{ nx, ny, members: number[][] }`; every member must be complete (no missing cells). */
export function readMembersFile(path: string): MembersFile {
  const obj = readJson(path)
  if (typeof obj !== 'object' || obj === null) throw new UsageError(`${path}: expected an object { nx, ny, members }`)
  const o = obj as Record<string, unknown>
  const nx = dimension(o, 'nx', path)
  const ny = dimension(o, 'ny', path)
  if (!Array.isArray(o.members) || o.members.length === 0) throw new UsageError(`${path}: "members" must be a non-empty array of grids`)
  const members = o.members.map((m, k) => toValues(m, nx * ny, `${path}: members[${k}]`, false))
  return { nx, ny, members }
}

/** JSON-friendly copy of a typed array (NaN becomes null). */
export function toJsonArray(a: ArrayLike<number>): (number | null)[] {
  return Array.from(a, (v) => (Number.isFinite(v) ? v : null))
}

/** Writes JSON to a file, or to stdout when path is undefined or "-". */
export function writeJson(path: string | undefined, value: unknown): void {
  const text = JSON.stringify(value) + '\n'
  if (!path || path === '-') process.stdout.write(text)
  else writeFileSync(path, text)
}
