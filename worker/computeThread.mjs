// Worker-thread bootstrap: loader hooks registered in the main thread are not inherited by
// threads, so register tsx here before loading the TypeScript entry.
import { register } from 'tsx/esm/api'

register()
await import('./computeThread.ts')
