// Starts real worker processes for queue tests (killed with SIGKILL to simulate a crash).
import { spawn, type ChildProcess } from 'node:child_process'
import { fileURLToPath } from 'node:url'

const ROOT = fileURLToPath(new URL('../..', import.meta.url))

export interface WorkerProcess { child: ChildProcess; output: () => string; kill: (signal?: NodeJS.Signals) => Promise<void> }

export function startWorker(env: Record<string, string> = {}): WorkerProcess {
  // node --import tsx: one process (no npx wrapper), so a kill really kills the worker.
  const child = spawn(process.execPath, ['--import', 'tsx', 'worker/index.ts'], {
    cwd: ROOT,
    env: { ...process.env, TESSERA_WORKER_THREADS: '1', TESSERA_TASK_STALE_SECONDS: '4', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let out = ''
  child.stdout!.on('data', (d) => { out += d })
  child.stderr!.on('data', (d) => { out += d })
  return {
    child,
    output: () => out,
    kill: (signal = 'SIGTERM') => new Promise((resolve) => {
      if (child.exitCode !== null || child.signalCode !== null) return resolve()
      child.once('exit', () => resolve())
      child.kill(signal)
    }),
  }
}

export async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 90_000, everyMs = 300): Promise<T> {
  const end = Date.now() + timeoutMs
  while (Date.now() < end) {
    const v = await probe()
    if (v) return v
    await new Promise((r) => setTimeout(r, everyMs))
  }
  throw new Error(`timed out waiting for ${what}`)
}
