/**
 * Entry points: read one ensemble run from bytes (upload) or from a path (command line). Pure with
 * respect to storage: nothing is written anywhere, so a server can validate before it stores.
 */
import { open, readFile, stat } from 'node:fs/promises'
import { DEFAULT_MAX_BYTES, formatBytes } from './assembleRun'
import { readCfRun } from './cfReader'
import { IngestError } from './errors'
import { readGeotiffRun } from './geotiffReader'
import { openNetcdfClassic } from './netcdfClassic'
import { withNetcdf4 } from './netcdf4'
import { SNIFF_BYTES, sniffFormat } from './sniff'
import { readTesseraJson } from './tesseraJson'
import type { EnsembleRun, ReadOptions } from './types'

type ResolvedOptions = ReadOptions & { maxBytes: number; maxDecodedBytes: number }

function resolveOptions(options: ReadOptions): ResolvedOptions {
  const maxBytes = options.maxBytes ?? DEFAULT_MAX_BYTES
  return { ...options, maxBytes, maxDecodedBytes: options.maxDecodedBytes ?? 4 * maxBytes }
}

function checkSize(size: number, options: ResolvedOptions): void {
  if (size > options.maxBytes) throw new IngestError('too_large', `The file is ${formatBytes(size)}; the limit is ${formatBytes(options.maxBytes)}.`)
}

async function geotiffFrom(source: { bytes: Uint8Array } | { path: string }, fileName: string, fileSize: number, options: ResolvedOptions): Promise<EnsembleRun> {
  const { fromArrayBuffer, fromFile } = await import('geotiff')
  let tiff
  try {
    if ('path' in source) {
      tiff = await fromFile(source.path)
    } else {
      const { bytes } = source
      const whole = bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength && bytes.buffer instanceof ArrayBuffer
      tiff = await fromArrayBuffer(whole ? bytes.buffer as ArrayBuffer : bytes.slice().buffer)
    }
  } catch (err) {
    throw new IngestError('corrupt_file', `The GeoTIFF is damaged or truncated (${(err as Error).message}).`)
  }
  try {
    return await readGeotiffRun(tiff, fileName, fileSize, options)
  } finally {
    tiff.close?.()
  }
}

/**
 * Reads an ensemble file held in memory. The format is recognised from the first bytes
 * (NetCDF classic/64-bit offset, NetCDF-4, GeoTIFF, Tessera JSON); `fileName` is used in messages.
 * Throws IngestError (with `code` and a forecaster-readable message) for anything it refuses.
 */
export async function readEnsembleFile(bytes: Uint8Array, fileName: string, options: ReadOptions = {}): Promise<EnsembleRun> {
  const opts = resolveOptions(options)
  checkSize(bytes.byteLength, opts)
  const format = sniffFormat(bytes.subarray(0, SNIFF_BYTES), fileName)
  switch (format) {
    case 'netcdf-classic': return readCfRun(openNetcdfClassic(bytes), format, opts)
    case 'netcdf-4': return withNetcdf4({ bytes }, (ds) => readCfRun(ds, format, opts))
    case 'geotiff': return geotiffFrom({ bytes }, fileName, bytes.byteLength, opts)
    case 'tessera-json': return readTesseraJson(new TextDecoder('utf-8').decode(bytes), opts)
  }
}

/**
 * Reads an ensemble file from disk. The size cap is checked on the file's size before reading;
 * NetCDF-4 and GeoTIFF files are read in place (chunk by chunk) rather than loaded whole.
 */
export async function readEnsembleFromPath(path: string, options: ReadOptions = {}): Promise<EnsembleRun> {
  const opts = resolveOptions(options)
  let size: number
  const head = new Uint8Array(SNIFF_BYTES)
  let headLength = 0
  try {
    const info = await stat(path)
    if (!info.isFile()) throw new Error('not a regular file')
    size = info.size
    checkSize(size, opts)
    const handle = await open(path, 'r')
    try { headLength = (await handle.read(head, 0, SNIFF_BYTES, 0)).bytesRead } finally { await handle.close() }
  } catch (err) {
    if (err instanceof IngestError) throw err
    throw new IngestError('unreadable_file', `Cannot read "${path}" (${(err as NodeJS.ErrnoException).code ?? (err as Error).message}).`)
  }
  const format = sniffFormat(head.subarray(0, headLength), path)
  switch (format) {
    case 'netcdf-4': return withNetcdf4({ path }, (ds) => readCfRun(ds, format, opts))
    case 'geotiff': return geotiffFrom({ path }, path, size, opts)
    case 'netcdf-classic': return readCfRun(openNetcdfClassic(new Uint8Array(await readFile(path))), format, opts)
    case 'tessera-json': return readTesseraJson(await readFile(path, 'utf8'), opts)
  }
}
