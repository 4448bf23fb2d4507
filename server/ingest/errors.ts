/** Why a file was refused; each code has one meaning so the upload route and the CLI can react to it. */
export type IngestErrorCode =
  | 'unreadable_file' // the path cannot be opened
  | 'too_large' // over the size cap
  | 'unknown_format' // not NetCDF, GeoTIFF or Tessera JSON
  | 'corrupt_file' // recognised format, but truncated or damaged
  | 'no_members' // no data variable, or an empty member dimension
  | 'ambiguous_variable' // several candidate variables and none chosen
  | 'variable_not_found' // the chosen variable is not in the file
  | 'unsupported_layout' // extra dimensions, rotated GeoTIFF, curvilinear grid, …
  | 'missing_coordinates' // the grid cannot be placed on the Earth
  | 'unsupported_projection'
  | 'grid_too_small' // fewer than 2 cells along an axis
  | 'shape_mismatch'
  | 'non_monotonic' // coordinates or times not strictly ordered
  | 'unknown_units'
  | 'incompatible_units' // units do not fit the standard name
  | 'missing_time'
  | 'bad_time_units'
  | 'unsupported_calendar'
  | 'inconsistent_times' // time, forecast_reference_time and forecast_period disagree
  | 'all_missing'
  | 'non_finite'

const HTTP_STATUS: Partial<Record<IngestErrorCode, number>> = { too_large: 413, unknown_format: 415, unreadable_file: 400 }

/**
 * A file Tessera refuses, with a message a forecaster can act on (one line, no stack traces).
 * `httpStatus` is the status an upload route should answer with (413, 415, otherwise 422).
 */
export class IngestError extends Error {
  readonly code: IngestErrorCode
  readonly httpStatus: number
  constructor(code: IngestErrorCode, message: string) {
    super(message)
    this.name = 'IngestError'
    this.code = code
    this.httpStatus = HTTP_STATUS[code] ?? 422
  }
}

/** Shorthand for `throw new IngestError(code, message)` in expression position. */
export function refuse(code: IngestErrorCode, message: string): never {
  throw new IngestError(code, message)
}
