/**
 * pdfmake with Atkinson Hyperlegible embedded: the full TTFs from @expo-google-fonts (WOFF2 crashes
 * pdfmake's font engine; the web WOFF files lack glyphs such as ≥). The fonts come from the Nitro
 * server assets 'assets:fonts' when the build bundles them, else from node_modules on disk. The
 * virtual file system holds them; URL and local-file access are denied so a document can never fetch.
 */
import { readFile } from 'node:fs/promises'
import { existsSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'
import pdfmake from 'pdfmake'

export const PDF_FONT_FAMILY = 'Atkinson'
const PACKAGE = '@expo-google-fonts/atkinson-hyperlegible'
export const PDF_FONT_FILES = {
  normal: 'AtkinsonHyperlegible_400Regular.ttf',
  bold: 'AtkinsonHyperlegible_700Bold.ttf',
  italics: 'AtkinsonHyperlegible_400Regular_Italic.ttf',
  bolditalics: 'AtkinsonHyperlegible_700Bold_Italic.ttf',
} as const
const FOLDERS: Record<string, string> = {
  AtkinsonHyperlegible_400Regular: '400Regular', AtkinsonHyperlegible_700Bold: '700Bold',
  AtkinsonHyperlegible_400Regular_Italic: '400Regular_Italic', AtkinsonHyperlegible_700Bold_Italic: '700Bold_Italic',
}

async function fromServerAssets(file: string): Promise<Buffer | null> {
  // useStorage exists inside Nitro only (scripts and unit tests fall through to the disk).
  if (typeof useStorage !== 'function') return null
  try {
    const storage = useStorage('assets:fonts')
    const key = (await storage.getKeys()).find((k) => k.endsWith(file))
    if (!key) return null
    const raw = await storage.getItemRaw(key)
    return raw ? Buffer.from(raw as Uint8Array) : null
  } catch {
    return null
  }
}

function packageFolders(): string[] {
  const folders: string[] = []
  try { folders.push(dirname(createRequire(import.meta.url).resolve(`${PACKAGE}/package.json`))) } catch { /* not resolvable from the bundle */ }
  folders.push(join(process.cwd(), 'node_modules', PACKAGE))
  return folders
}

async function fontBytes(file: string): Promise<Buffer> {
  const asset = await fromServerAssets(file)
  if (asset) return asset
  for (const folder of packageFolders()) {
    const path = join(folder, FOLDERS[file.replace('.ttf', '')]!, file)
    if (existsSync(path)) return readFile(path)
  }
  throw new Error(`The PDF font ${file} was found neither in the server assets nor in node_modules/${PACKAGE}.`)
}

let ready: Promise<typeof pdfmake> | null = null

/** pdfmake with the fonts registered and every outside access denied (loaded once per process). */
export function usePdfMake(): Promise<typeof pdfmake> {
  ready ??= (async () => {
    for (const file of Object.values(PDF_FONT_FILES)) pdfmake.virtualfs.writeFileSync(file, await fontBytes(file))
    pdfmake.setFonts({ [PDF_FONT_FAMILY]: { ...PDF_FONT_FILES } })
    pdfmake.setUrlAccessPolicy(() => false)
    pdfmake.setLocalAccessPolicy(() => false)
    return pdfmake
  })().catch((err) => { ready = null; throw err })
  return ready
}
