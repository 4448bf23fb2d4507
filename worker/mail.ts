// The worker's mail side: wake-up jobs from the pg-boss queue and a periodic sweep both drain
// the outbox (worker/mailSender.ts); a failed attempt schedules the wake-up for its retry.
import { useBoss, MAIL_QUEUE } from '../server/utils/jobs'
import { wakeMailSender } from '../server/utils/mailOutbox'
import { createMailSender, type SendOutcome } from './mailSender'

export async function startMailSender(opts: { workerId: string; log: (message: string) => void }) {
  const sender = createMailSender({ workerId: opts.workerId, log: opts.log })
  const drain = async (why: string) => {
    try {
      const outcomes: SendOutcome[] = await sender.drain()
      const retries = outcomes.map((x) => x.retryAt).filter((d): d is Date => d !== null)
      if (retries.length) await wakeMailSender({ startAfter: new Date(Math.min(...retries.map((d) => d.getTime()))) })
    } catch (err) {
      opts.log(`mail ${why} failed: ${(err as Error).message}`)
    }
  }
  const boss = await useBoss()
  await boss.work(MAIL_QUEUE, { batchSize: 10, pollingIntervalSeconds: 0.5 }, async () => { await drain('wake-up') })
  const everyMs = Number(process.env.TESSERA_MAIL_SWEEP_SECONDS ?? 10) * 1000
  const sweep = setInterval(() => { void drain('sweep') }, everyMs)
  void drain('start')
  return {
    async stop() {
      clearInterval(sweep)
    },
  }
}
