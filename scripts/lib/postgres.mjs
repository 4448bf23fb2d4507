// A PostgreSQL 15 + PostGIS cluster owned by the project, on loopback only.
import { existsSync, mkdirSync, chownSync, rmSync } from 'node:fs'
import { join, dirname } from 'node:path'
import { tmpdir } from 'node:os'
import { createHash } from 'node:crypto'
import { spawnSync } from 'node:child_process'
import { log, run, capture, isRoot, ensureDebianPackages } from './system.mjs'

const PG_BIN = '/usr/lib/postgresql/15/bin'
const POSTGIS_CONTROL = '/usr/share/postgresql/15/extension/postgis.control'

export function ensurePostgresInstalled() {
  ensureDebianPackages(['postgresql-15', 'postgresql-15-postgis-3'], [`${PG_BIN}/initdb`, POSTGIS_CONTROL])
}

/** True when the postgres user can enter every parent folder of `dir` (it refuses to run as root). */
function postgresCanReach(dir) {
  if (!isRoot) return true
  let d = dir
  while (d !== dirname(d)) {
    d = dirname(d)
    const res = spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', d])
    if (res.status !== 0) return false
  }
  return true
}

/** Runs a PostgreSQL binary as the postgres user when we are root, else as ourselves. */
function pg(bin, args, opts = {}) {
  const full = join(PG_BIN, bin)
  return isRoot ? run('runuser', ['-u', 'postgres', '--', full, ...args], { cwd: '/', ...opts }) : run(full, args, opts)
}

/**
 * Picks the data folder: the preferred one inside the project when postgres can reach it,
 * otherwise a folder in the system temporary directory named after the project path.
 */
export function resolveDataDir(preferred) {
  if (postgresCanReach(preferred)) return preferred
  const tag = createHash('sha1').update(preferred).digest('hex').slice(0, 10)
  const fallback = join(tmpdir(), `tessera-pg-${tag}`)
  log(`the postgres user cannot reach ${preferred}; using ${fallback}`)
  return fallback
}

function isRunning(dataDir) {
  const full = join(PG_BIN, 'pg_ctl')
  const args = ['-D', dataDir, 'status']
  const res = isRoot ? spawnSync('runuser', ['-u', 'postgres', '--', full, ...args], { cwd: '/' }) : spawnSync(full, args)
  return res.status === 0
}

/**
 * Creates (if needed) and starts a cluster in `dataDir` listening on 127.0.0.1:`port`, then
 * creates `database`. `throwaway` turns off durability for speed (tests only).
 * Returns { url, stop }.
 */
export function startCluster({ dataDir, port, database, throwaway = false }) {
  ensurePostgresInstalled()
  mkdirSync(dirname(dataDir), { recursive: true })
  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    log(`creating a PostgreSQL cluster in ${dataDir}`)
    mkdirSync(dataDir, { recursive: true })
    if (isRoot) chownSync(dataDir, Number(capture('id', ['-u', 'postgres'])), Number(capture('id', ['-g', 'postgres'])))
    pg('initdb', ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8'], { stdio: ['ignore', 'ignore', 'inherit'] })
  }
  if (!isRunning(dataDir)) {
    const opts = [`-c listen_addresses=127.0.0.1`, `-p ${port}`, `-k ${dataDir}`]
    if (throwaway) opts.push('-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off')
    log(`starting PostgreSQL on 127.0.0.1:${port}`)
    pg('pg_ctl', ['-D', dataDir, '-l', join(dataDir, 'server.log'), '-w', '-o', opts.join(' '), 'start'], { stdio: ['ignore', 'ignore', 'inherit'] })
  }
  const psql = (sql, db = 'postgres') => capture('psql', ['-h', '127.0.0.1', '-p', String(port), '-U', 'postgres', '-d', db, '-tAc', sql])
  if (psql(`SELECT 1 FROM pg_database WHERE datname = '${database}'`) !== '1') {
    run('psql', ['-q', '-h', '127.0.0.1', '-p', String(port), '-U', 'postgres', '-c', `CREATE DATABASE "${database}"`])
  }
  const stop = () => {
    if (isRunning(dataDir)) pg('pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', 'stop'], { stdio: ['ignore', 'ignore', 'inherit'] })
  }
  return { url: `postgres://postgres@127.0.0.1:${port}/${database}`, stop, dataDir }
}

/** Stops (if running) and removes a throwaway cluster's folder. */
export function removeCluster(dataDir) {
  if (existsSync(join(dataDir, 'PG_VERSION')) && isRunning(dataDir)) pg('pg_ctl', ['-D', dataDir, '-m', 'immediate', '-w', 'stop'], { stdio: ['ignore', 'ignore', 'inherit'] })
  rmSync(dataDir, { recursive: true, force: true })
}

