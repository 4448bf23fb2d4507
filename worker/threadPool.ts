// A small pool of worker threads so one worker process uses every core for the numerics.
import { Worker } from 'node:worker_threads'
import type { DownscaleMemberInput, DownscaleMemberOutput } from '../shared/numerics/pipeline/downscaleMember'

interface Pending { input: DownscaleMemberInput; resolve: (o: DownscaleMemberOutput) => void; reject: (e: Error) => void }

export class ThreadPool {
  private idle: Worker[] = []
  private queue: Pending[] = []
  private all: Worker[] = []

  constructor(size: number) {
    for (let k = 0; k < size; k++) this.spawn()
  }

  private spawn() {
    const w = new Worker(new URL('./computeThread.mjs', import.meta.url))
    w.unref()
    this.all.push(w)
    this.idle.push(w)
  }

  run(input: DownscaleMemberInput): Promise<DownscaleMemberOutput> {
    return new Promise((resolve, reject) => { this.queue.push({ input, resolve, reject }); this.pump() })
  }

  private pump() {
    while (this.idle.length && this.queue.length) {
      const w = this.idle.pop()!
      const job = this.queue.shift()!
      const done = (fn: () => void) => { w.off('message', onMessage); w.off('error', onError); this.idle.push(w); fn(); this.pump() }
      const onMessage = (msg: { ok: true; output: DownscaleMemberOutput } | { ok: false; message: string }) =>
        done(() => (msg.ok ? job.resolve(msg.output) : job.reject(new Error(msg.message))))
      const onError = (err: Error) => {
        // A crashed thread is replaced; the task fails with the error.
        w.off('message', onMessage)
        this.all = this.all.filter((x) => x !== w)
        this.spawn()
        job.reject(err)
        this.pump()
      }
      w.on('message', onMessage)
      w.once('error', onError)
      w.postMessage(job.input)
    }
  }

  async close(): Promise<void> {
    await Promise.all(this.all.map((w) => w.terminate()))
  }
}
