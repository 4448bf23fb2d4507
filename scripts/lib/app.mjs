// Building and serving the Nuxt app, shared by `npm start` and `npm test`.
import { createHash, randomBytes } from 'node:crypto'
import { existsSync, readFileSync, readdirSync, statSync, writeFileSync, mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { ROOT, log, run } from './system.mjs'

const SOURCES = ['app.vue', 'error.vue', 'nuxt.config.ts', 'tailwind.config.ts', 'package-lock.json',
  'pages', 'components', 'composables', 'layouts', 'middleware', 'plugins', 'stores', 'assets', 'public', 'server', 'shared']

/** Fingerprint of every file the built app depends on (paths, sizes, modification times). */
function sourceFingerprint() {
  const hash = createHash('sha256')
  const visit = (rel) => {
    const abs = join(ROOT, rel)
    if (!existsSync(abs)) return
    const st = statSync(abs)
    if (st.isDirectory()) { for (const name of readdirSync(abs).sort()) visit(join(rel, name)) }
    else hash.update(`${rel}\0${st.size}\0${st.mtimeMs}\n`)
  }
  SOURCES.forEach(visit)
  return hash.digest('hex')
}

/** Runs `nuxt build` unless .output was built from exactly the current sources. */
export function buildIfNeeded() {
  const stamp = join(ROOT, '.output', '.tessera-fingerprint')
  const current = sourceFingerprint()
  if (existsSync(stamp) && readFileSync(stamp, 'utf8') === current) { log('app build is up to date'); return }
  log('building the app (about a minute)…')
  run('npx', ['nuxt', 'build'], { env: { ...process.env, NODE_OPTIONS: '--max-old-space-size=4096' } })
  writeFileSync(stamp, current)
}

/** A session password kept in the data folder so restarts keep people signed in (demo mode). */
export function persistentSecret(dataFolder) {
  mkdirSync(dataFolder, { recursive: true })
  const file = join(dataFolder, 'session-secret')
  if (!existsSync(file)) writeFileSync(file, randomBytes(32).toString('base64url'), { mode: 0o600 })
  return readFileSync(file, 'utf8').trim()
}

export const SERVER_ENTRY = join(ROOT, '.output', 'server', 'index.mjs')
