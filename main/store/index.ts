/** The run store's public surface (run folders per CONTRACTS.md). */
export {
  createRun,
  type CreateRunOptions,
  type RunEventInput,
  type RunWriter,
  type SampleRow,
  type WriterOptions,
} from './run-writer.ts';
export { readRunFolder, readRunStatus, type ReadOptions, type RunFolderContents } from './run-reader.ts';
export { parseSamplesCsv, type DroppedLine, type ParsedSamples } from './samples-csv.ts';
export { readSampleTable, type SampleTable } from './sample-table.ts';
export { parseEventsJsonl } from './events-jsonl.ts';
export { assertRunId, dutIdSchema, makeRunId, runIdSchema } from './run-id.ts';
export { runFolder } from './store-path.ts';
export { RunFormatError, RUN_SCHEMA } from './run-meta.ts';
export { defaultRunsDir, resolveRunsDir } from './runs-dir.ts';
export { nodeStoreFs, type StoreFileHandle, type StoreFs } from './store-fs.ts';
export {
  addNote,
  deleteRun,
  listRuns,
  listRunsDetailed,
  listTrash,
  openRun,
  renameDut,
  restoreRun,
  TRASH,
  type ListResult,
  type OpenedRun,
} from './run-store.ts';
export { reopenRun, type ReopenRunOptions } from './reopen-run.ts';
export { cacheFinishedRun, CACHE_AT_FINISH_MIN_ROWS } from './cached-samples.ts';
export { importCsvRun, type ImportCsvOptions } from './csv-import.ts';
export { CsvImportError, readPlainCsv, type CsvProblem, type PlainCsvTable } from './plain-csv.ts';
export { StoreError, type StoreErrorReason } from './store-error.ts';
