// Password hashing for scripts that run outside the server (seeding, first admin). Uses the
// same scrypt driver with the same defaults as nuxt-auth-utils' hashPassword, so the server's
// verifyPassword accepts these hashes (checked by the sign-in integration tests).
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'

const hash = new Hash(new Scrypt({}))

export function hashPasswordForScript(password: string): Promise<string> {
  return hash.make(password)
}
