// The local SMTP stand-in process (`npm start` in demo mode and `npm test` start it):
//   DATABASE_URL=… TESSERA_SMTP_STAND_IN_PORT=2525 npx tsx scripts/smtp-stand-in.ts
// Loopback only; what arrives is stored for the Mail log page and delivered nowhere.
import { closeDB } from '../server/utils/db'
import { DEFAULT_STAND_IN_PORT } from '../server/utils/mailSettings'
import { startSmtpStandIn } from './lib/smtpStandIn'

const port = Number(process.env.TESSERA_SMTP_STAND_IN_PORT ?? process.env.TESSERA_SMTP_PORT ?? DEFAULT_STAND_IN_PORT)
const standIn = await startSmtpStandIn({ port, log: (m) => console.log(`[mail stand-in] ${m}`) })
console.log(`[mail stand-in] listening on 127.0.0.1:${port}`)

async function stop() {
  await standIn.close()
  await closeDB()
  process.exit(0)
}
process.on('SIGTERM', stop)
process.on('SIGINT', stop)
