// Worker-thread bootstrap for method checks (as computeThread.mjs): register tsx, then load the TypeScript entry.
import { register } from 'tsx/esm/api'

register()
await import('./methodCheckThread.ts')
