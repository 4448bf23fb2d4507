// Thread entry: runs one method check (pure numerics) and posts progress, then the report.
import { parentPort } from 'node:worker_threads'
import { runMethodCheck, type MethodCheckInput } from '../shared/numerics/pipeline/methodCheck'

export type MethodCheckThreadMessage =
  | { kind: 'progress'; fraction: number; stage: string }
  | { kind: 'done'; report: ReturnType<typeof runMethodCheck> }
  | { kind: 'error'; message: string }

parentPort!.once('message', (input: MethodCheckInput) => {
  const post = (m: MethodCheckThreadMessage) => parentPort!.postMessage(m)
  try {
    const report = runMethodCheck(input, (fraction, stage) => post({ kind: 'progress', fraction, stage }))
    post({ kind: 'done', report })
  } catch (err) {
    post({ kind: 'error', message: err instanceof Error ? err.message : String(err) })
  }
})
