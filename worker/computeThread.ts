// Thread entry: runs one member's fit and sampling, returns the result with its buffers transferred.
import { parentPort } from 'node:worker_threads'
import { downscaleMember, type DownscaleMemberInput } from '../shared/numerics/pipeline/downscaleMember'

parentPort!.on('message', (input: DownscaleMemberInput) => {
  try {
    const output = downscaleMember(input)
    parentPort!.postMessage({ ok: true, output }, [output.packed.data.buffer as ArrayBuffer])
  } catch (err) {
    parentPort!.postMessage({ ok: false, message: err instanceof Error ? err.message : String(err) })
  }
})
