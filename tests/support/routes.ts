// Lists every API route from the file system, Nuxt-style: server/api/users/[id].patch.ts → PATCH /api/users/:id.
import { readdirSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'

const API_DIR = fileURLToPath(new URL('../../server/api', import.meta.url))
const METHODS = ['get', 'post', 'put', 'patch', 'delete']

export interface RouteFile { method: string; path: string; file: string }

export function listApiRoutes(dir = API_DIR): RouteFile[] {
  const out: RouteFile[] = []
  for (const name of readdirSync(dir)) {
    const abs = join(dir, name)
    if (statSync(abs).isDirectory()) { out.push(...listApiRoutes(abs)); continue }
    const m = /^(.*?)(?:\.(get|post|put|patch|delete))?\.ts$/.exec(name)
    if (!m) continue
    const method = (m[2] ?? 'get').toUpperCase()
    if (!METHODS.includes(method.toLowerCase())) continue
    const rel = relative(API_DIR, join(dir, m[1]!)).split('\\').join('/')
    const path = '/api/' + rel.replace(/(^|\/)index$/, '').replace(/\[(\w+)\]/g, ':$1')
    out.push({ method, path: path.replace(/\/$/, ''), file: relative(API_DIR, abs) })
  }
  return out.sort((a, b) => (a.path + a.method).localeCompare(b.path + b.method))
}
