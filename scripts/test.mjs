#!/usr/bin/env node
// `npm test`: the same automatic set-up as `npm start`, then every test against real services:
// numerics + unit, integration (real PostgreSQL on 127.0.0.1:54330, throwaway), end-to-end (Chromium).
import { join } from 'node:path'
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import { spawnSync } from 'node:child_process'
import { ROOT, log, run, ensureNodeModules, ensureDebianPackages, startChild, waitForHttp, acquireLock } from './lib/system.mjs'

ensureNodeModules()
const releaseLock = await acquireLock('tessera-npm-test')
const { ensurePostgresInstalled, resolveDataDir, startCluster, removeCluster } = await import('./lib/postgres.mjs')
const { buildIfNeeded, SERVER_ENTRY } = await import('./lib/app.mjs')
ensurePostgresInstalled()
ensureDebianPackages(['chromium'], ['/usr/bin/chromium'])
// pdftotext, pdftoppm and pdffonts check the briefing PDFs.
ensureDebianPackages(['poppler-utils'], ['/usr/bin/pdftotext', '/usr/bin/pdftoppm', '/usr/bin/pdffonts'])

const resultsDir = join(ROOT, 'test-results')
rmSync(resultsDir, { recursive: true, force: true })
mkdirSync(resultsDir, { recursive: true })
const only = process.argv.slice(2) // e.g. `npm test -- unit` runs one phase
const wanted = (phase) => only.length === 0 || only.includes(phase)

/** Runs vitest for some projects; returns { passed, failed } from its JSON report. */
function vitest(phase, projects, env = process.env) {
  const outputFile = join(resultsDir, `${phase}.json`)
  const args = ['vitest', 'run', ...projects.flatMap((p) => ['--project', p]), '--reporter=default', '--reporter=json', `--outputFile.json=${outputFile}`]
  log(`${phase}: vitest ${projects.join(', ')}`)
  const res = spawnSync('npx', args, { cwd: ROOT, stdio: 'inherit', env })
  if (!existsSync(outputFile)) return { passed: 0, failed: 1, crashed: true }
  const report = JSON.parse(readFileSync(outputFile, 'utf8'))
  const failed = report.numFailedTests + (res.status !== 0 && report.numFailedTests === 0 ? 1 : 0)
  return { passed: report.numPassedTests, failed }
}

const totals = { passed: 0, failed: 0 }
const add = (r) => { totals.passed += r.passed; totals.failed += r.failed }

if (wanted('unit')) add(vitest('unit', ['numerics', 'unit']))

let cluster = null
let server = null
let mailStandIn = null
try {
  if (wanted('integration') || wanted('e2e')) {
    const dataDir = resolveDataDir(join(ROOT, '.data', 'pg-test'))
    removeCluster(dataDir)
    cluster = startCluster({ dataDir, port: Number(process.env.TESSERA_TEST_PG_PORT ?? 54330), database: 'tessera_test', throwaway: true })
    const env = { ...process.env, DATABASE_URL: cluster.url, NUXT_DATABASE_URL: cluster.url }
    run('npx', ['tsx', 'scripts/migrate.ts'], { env })
    run('npx', ['tsx', 'scripts/seed-demo.ts'], { env: { ...env, TESSERA_DEMO_SIZE: 'small' } })
    buildIfNeeded()
    const port = Number(process.env.TESSERA_TEST_PORT ?? 3300)
    const baseUrl = `http://localhost:${port}`
    const serverEnv = {
      ...env, PORT: String(port), HOST: '127.0.0.1',
      NUXT_SESSION_PASSWORD: randomBytes(32).toString('base64url'),
      NUXT_DEMO_MODE: 'true', NUXT_PUBLIC_DEMO_MODE: 'true', NUXT_PUBLIC_BASE_URL: baseUrl,
      // Tests stand in for many client addresses through X-Forwarded-For (throttling per address).
      TESSERA_TRUST_PROXY: 'true',
      // Short session lifetime is exercised by a dedicated test through this knob.
      NUXT_SESSION_MAX_AGE_SECONDS: '43200',
      // Small cap so the oversized-upload test stays small; uploads land in a folder the tests inspect.
      TESSERA_MAX_UPLOAD_MB: '2',
      TESSERA_UPLOAD_DIR: join(resultsDir, 'uploads'),
    }
    server = startChild('web', process.execPath, [SERVER_ENTRY], { env: serverEnv })
    // The local SMTP stand-in the tests' workers send to (what arrives lands in received_mail).
    const smtpPort = process.env.TESSERA_TEST_SMTP_PORT ?? '2526'
    mailStandIn = startChild('mail', process.execPath, ['--import', 'tsx', 'scripts/smtp-stand-in.ts'], { env: { ...env, TESSERA_SMTP_STAND_IN_PORT: smtpPort } })
    // Integration tests start and kill their own workers (recovery tests); none runs by default.
    await waitForHttp(`${baseUrl}/api/health`)
    const testEnv = { ...env, TESSERA_SMTP_HOST: '127.0.0.1', TESSERA_SMTP_PORT: smtpPort, TESSERA_MAIL_RETRY_SECONDS: '1', NUXT_PUBLIC_BASE_URL: baseUrl, TESSERA_UPLOAD_DIR: serverEnv.TESSERA_UPLOAD_DIR, TESSERA_TEST_BASE_URL: baseUrl, TESSERA_TEST_RESULTS: resultsDir, TESSERA_TEST_SESSION_PASSWORD: serverEnv.NUXT_SESSION_PASSWORD }
    const projects = ['integration', 'e2e'].filter(wanted)
    add(vitest('integration+e2e', projects, testEnv))
  }
} catch (err) {
  console.error(err)
  totals.failed += 1
} finally {
  server?.kill('SIGTERM')
  mailStandIn?.kill('SIGTERM')
  try { cluster?.stop() } catch (err) { console.error(err) }
  if (cluster) removeCluster(cluster.dataDir)
}

log(`artefacts (screenshots, reports) in ${resultsDir}`)
console.log(`\nTotal: ${totals.passed} passed, ${totals.failed} failed`)
releaseLock()
process.exit(totals.failed === 0 ? 0 : 1)
