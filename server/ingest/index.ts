/** Reading and validating uploaded ensemble files: the public surface for the server and the CLI. */
export { readEnsembleFile, readEnsembleFromPath } from './readEnsemble'
export { summariseRun } from './summary'
export { IngestError, type IngestErrorCode } from './errors'
export { DEFAULT_MAX_BYTES } from './assembleRun'
export { TESSERA_JSON_VERSION } from './tesseraJson'
export type { EnsembleFormat, EnsembleGrid, EnsembleRun, ReadOptions, RunSummary } from './types'
