/**
 * Recognises an ensemble file by its first bytes (magic numbers), never by its name:
 * CDF\x01 / CDF\x02 (NetCDF classic / 64-bit offset), \x89HDF\r\n\x1a\n (HDF5, i.e. NetCDF-4),
 * II*\0 / MM\0* (TIFF; II+\0 / MM\0+ BigTIFF), and '{' (Tessera JSON, after optional BOM/whitespace).
 */
import { IngestError } from './errors'
import type { EnsembleFormat } from './types'

/** Bytes needed by sniffFormat. */
export const SNIFF_BYTES = 64

const starts = (head: Uint8Array, bytes: number[]) => bytes.every((b, k) => head[k] === b)

/** The format of a file from its first SNIFF_BYTES bytes; throws IngestError('unknown_format') with a hint. */
export function sniffFormat(head: Uint8Array, fileName: string): EnsembleFormat {
  if (starts(head, [0x43, 0x44, 0x46])) return 'netcdf-classic' // 'CDF' + version byte, checked by the reader
  if (starts(head, [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a])) return 'netcdf-4'
  if (starts(head, [0x49, 0x49, 0x2a, 0x00]) || starts(head, [0x4d, 0x4d, 0x00, 0x2a])) return 'geotiff'
  if (starts(head, [0x49, 0x49, 0x2b, 0x00]) || starts(head, [0x4d, 0x4d, 0x00, 0x2b])) return 'geotiff'
  let k = starts(head, [0xef, 0xbb, 0xbf]) ? 3 : 0
  while (k < head.length && (head[k] === 0x20 || head[k] === 0x09 || head[k] === 0x0a || head[k] === 0x0d)) k++
  if (head[k] === 0x7b) return 'tessera-json'
  const name = fileName.replace(/^.*[\\/]/, '')
  let hint = 'Tessera reads NetCDF (classic or NetCDF-4), GeoTIFF and Tessera JSON.'
  if (head.length === 0) hint = 'The file is empty.'
  else if (starts(head, [0x47, 0x52, 0x49, 0x42])) hint = 'It is a GRIB file; convert it to NetCDF first.'
  else if (starts(head, [0x1f, 0x8b])) hint = 'It is compressed with gzip; decompress it first.'
  else if (starts(head, [0x50, 0x4b, 0x03, 0x04])) hint = 'It is a ZIP archive; unpack it and upload the file inside.'
  const first = Array.from(head.subarray(0, 4), (b) => b.toString(16).padStart(2, '0')).join(' ')
  throw new IngestError('unknown_format', `"${name}" is not a format Tessera reads${head.length ? ` (it starts with bytes ${first})` : ''}. ${hint}`)
}
