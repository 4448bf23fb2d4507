// Set-up helpers shared by `npm start` and `npm test`. Plain Node (no dependencies): they run
// before node_modules exists.
import { spawnSync, spawn } from 'node:child_process'
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

export const ROOT = fileURLToPath(new URL('../..', import.meta.url))

export function log(message) {
  process.stdout.write(`\x1b[36m[tessera]\x1b[0m ${message}\n`)
}

/** Runs a command synchronously, inheriting output; throws on failure. */
export function run(cmd, args, opts = {}) {
  const res = spawnSync(cmd, args, { stdio: 'inherit', cwd: ROOT, ...opts })
  if (res.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed (exit ${res.status ?? res.signal})`)
  return res
}

/** Runs a command and returns its stdout (trimmed); null when it fails. */
export function capture(cmd, args, opts = {}) {
  const res = spawnSync(cmd, args, { encoding: 'utf8', cwd: ROOT, ...opts })
  return res.status === 0 ? res.stdout.trim() : null
}

export const isRoot = typeof process.getuid === 'function' && process.getuid() === 0

let aptUpdated = false
/** Installs Debian packages when any of the given paths is missing (needs root, as on CI). */
export function ensureDebianPackages(packages, mustExist) {
  if (mustExist.every((p) => existsSync(p))) return
  if (!isRoot) throw new Error(`missing ${mustExist.filter((p) => !existsSync(p)).join(', ')}: install the Debian packages ${packages.join(' ')} (needs root)`)
  log(`installing ${packages.join(' ')} from Debian's packages…`)
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  if (!aptUpdated) { run('apt-get', ['update', '-q'], { env }); aptUpdated = true }
  run('apt-get', ['install', '-y', '-q', '--no-install-recommends', ...packages], { env })
}

/** `npm ci` when node_modules is missing or older than package-lock.json. */
export function ensureNodeModules() {
  if (existsSync(`${ROOT}/node_modules/.package-lock.json`)) return
  log('installing dependencies (npm ci)…')
  run('npm', ['ci', '--no-audit', '--no-fund'])
}

/** Starts a long-running child process whose output is prefixed with a tag. */
export function startChild(tag, cmd, args, opts = {}) {
  const child = spawn(cmd, args, { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'], ...opts })
  const prefix = (stream, out) => {
    let buf = ''
    stream.on('data', (d) => {
      buf += d
      let i
      while ((i = buf.indexOf('\n')) >= 0) { out.write(`[${tag}] ${buf.slice(0, i)}\n`); buf = buf.slice(i + 1) }
    })
  }
  prefix(child.stdout, process.stdout)
  prefix(child.stderr, process.stderr)
  return child
}

/** Resolves when an HTTP URL answers (any status), rejects after the timeout. */
export async function waitForHttp(url, timeoutMs = 60_000) {
  const end = Date.now() + timeoutMs
  while (Date.now() < end) {
    try { await fetch(url); return } catch { await new Promise((r) => setTimeout(r, 300)) }
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`)
}

/**
 * A machine-wide lock (a folder in the temporary directory with the holder's pid), so that two
 * `npm test` runs on one machine wait for each other instead of fighting over ports and cores.
 * A lock whose holder has died is taken over.
 */
export async function acquireLock(name, { waitMs = 45 * 60_000 } = {}) {
  const { mkdirSync, writeFileSync, readFileSync, rmSync } = await import('node:fs')
  const { tmpdir } = await import('node:os')
  const dir = `${tmpdir()}/${name}.lock`
  const end = Date.now() + waitMs
  let told = false
  for (;;) {
    try {
      mkdirSync(dir)
      writeFileSync(`${dir}/pid`, String(process.pid))
      const release = () => rmSync(dir, { recursive: true, force: true })
      process.on('exit', release)
      return release
    } catch {
      let holder = NaN
      try { holder = Number(readFileSync(`${dir}/pid`, 'utf8')) } catch { /* being written */ }
      let alive = false
      try { if (holder) { process.kill(holder, 0); alive = true } } catch { alive = false }
      if (holder && !alive) { rmSync(dir, { recursive: true, force: true }); continue }
      if (Date.now() > end) throw new Error(`gave up waiting for ${dir} (held by pid ${holder})`)
      if (!told) { log(`waiting for another run to finish (${dir}, pid ${holder})…`); told = true }
      await new Promise((r) => setTimeout(r, 1000))
    }
  }
}
