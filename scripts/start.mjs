#!/usr/bin/env node
// `npm start`: everything from a fresh clone to a running Tessera on http://localhost:3000.
// Demo mode (default): a project-owned PostgreSQL on 127.0.0.1:54329 in .data/pg, demo data seeded.
// Production mode (TESSERA_MODE=production): uses DATABASE_URL and NUXT_SESSION_PASSWORD, seeds nothing.
import { join } from 'node:path'
import { ROOT, log, run, ensureNodeModules, startChild } from './lib/system.mjs'

const production = process.env.TESSERA_MODE === 'production'
const port = Number(process.env.PORT ?? 3000)

ensureNodeModules()
const { ensurePostgresInstalled, resolveDataDir, startCluster } = await import('./lib/postgres.mjs')
const { buildIfNeeded, persistentSecret, SERVER_ENTRY } = await import('./lib/app.mjs')

let cluster = null
let databaseUrl = process.env.DATABASE_URL
if (production) {
  if (!databaseUrl) throw new Error('TESSERA_MODE=production needs DATABASE_URL')
  if ((process.env.NUXT_SESSION_PASSWORD ?? '').length < 32) throw new Error('TESSERA_MODE=production needs NUXT_SESSION_PASSWORD (32+ characters)')
} else {
  ensurePostgresInstalled()
  const dataDir = resolveDataDir(join(ROOT, '.data', 'pg'))
  cluster = startCluster({ dataDir, port: Number(process.env.TESSERA_PG_PORT ?? 54329), database: 'tessera' })
  databaseUrl = cluster.url
}
const env = { ...process.env, DATABASE_URL: databaseUrl, NUXT_DATABASE_URL: databaseUrl }
run('npx', ['tsx', 'scripts/migrate.ts'], { env })
if (!production) run('npx', ['tsx', 'scripts/seed-demo.ts'], { env })
buildIfNeeded()

const serverEnv = {
  ...env,
  PORT: String(port),
  HOST: process.env.HOST ?? '0.0.0.0',
  NUXT_SESSION_PASSWORD: process.env.NUXT_SESSION_PASSWORD ?? persistentSecret(join(ROOT, '.data')),
  NUXT_DEMO_MODE: production ? 'false' : 'true',
  NUXT_PUBLIC_DEMO_MODE: production ? 'false' : 'true',
  NUXT_PUBLIC_BASE_URL: process.env.NUXT_PUBLIC_BASE_URL ?? `http://localhost:${port}`,
}
// Demo mode: a local SMTP stand-in on 127.0.0.1 takes the mail the worker sends (admin "Mail log").
const smtpPort = process.env.TESSERA_SMTP_STAND_IN_PORT ?? '2525'
const workerEnv = production ? env : { ...env, TESSERA_SMTP_HOST: '127.0.0.1', TESSERA_SMTP_PORT: smtpPort }
const children = [
  startChild('web', process.execPath, [SERVER_ENTRY], { env: serverEnv }),
  // Node itself with tsx's loader (not npx): one process per child, so stop()'s SIGTERM reaches it.
  ...(production ? [] : [startChild('mail', process.execPath, ['--import', 'tsx', 'scripts/smtp-stand-in.ts'], { env: { ...env, TESSERA_SMTP_STAND_IN_PORT: smtpPort } })]),
  startChild('worker', process.execPath, ['--import', 'tsx', 'worker/index.ts'], { env: workerEnv }),
]
log(`Tessera is starting on http://localhost:${port} ${production ? '' : '(demo mode: accounts in README.md)'} — Ctrl-C stops it`)

let stopping = false
function stop(code = 0) {
  if (stopping) return
  stopping = true
  log('stopping…')
  for (const c of children) c.kill('SIGTERM')
  setTimeout(() => {
    try { cluster?.stop() } catch (err) { console.error(err) }
    process.exit(code)
  }, 1500)
}
process.on('SIGINT', () => stop(0))
process.on('SIGTERM', () => stop(0))
for (const c of children) c.on('exit', (code) => { if (!stopping) { log(`a process exited (${code}); stopping everything`); stop(code ?? 1) } })
