/** Paths and expected values of the committed ingest fixtures (see tests/fixtures/ingest/write_cdl.py). */
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

export const FIXTURES = fileURLToPath(new URL('../../fixtures/ingest/', import.meta.url))

export function fixturePath(name: string): string { return FIXTURES + name }
export function fixtureBytes(name: string): Uint8Array { return new Uint8Array(readFileSync(fixturePath(name))) }

/** Corner longitudes/latitudes of the outer cell edges computed by GDAL/PROJ (make-fixtures.sh). */
export const gdalCorners = JSON.parse(readFileSync(fixturePath('reference_corners.json'), 'utf8')) as Record<string, [number, number][]>

/** The formulas written in each fixture's CDL comment (file-order indices). */
export const t2mKelvin = (t: number, m: number, jf: number, i: number) => 271.15 + 1.5 * t + 0.25 * m + 0.2 * jf + 0.05 * i
export const gustPacked = (m: number, t: number, j: number, i: number) => 2000 + 100 * t + 50 * m + 10 * j + i
export const precipKgM2 = (t: number, m: number, j: number, iFile: number) => 0.2 + 0.5 * t + 0.1 * m + 0.01 * j + 0.001 * iFile
export const gustUtmPacked = (m: number, jf: number, i: number) => 300 + 10 * m + 5 * jf + i

/** Great-circle distance by the spherical law of cosines: an independent formula from the reader's haversine. */
export function lawOfCosinesKm(lon1: number, lat1: number, lon2: number, lat2: number, radiusKm: number): number {
  const r = Math.PI / 180
  const c = Math.sin(lat1 * r) * Math.sin(lat2 * r) + Math.cos(lat1 * r) * Math.cos(lat2 * r) * Math.cos((lon2 - lon1) * r)
  return radiusKm * Math.acos(Math.min(1, c))
}

/** Checks that each corner matches one of the reference corners to `tol` degrees. */
export function sameCornerSet(actual: [number, number][], expected: [number, number][], tol: number): boolean {
  return actual.length === expected.length && actual.every(([lo, la]) => expected.some(([elo, ela]) => Math.abs(lo - elo) < tol && Math.abs(la - ela) < tol))
}
