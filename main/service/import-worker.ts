/**
 * Worker thread body of a CSV import (./import-off-thread.ts): parses the
 * text and writes the run folder with the store's own importCsvRun, so the
 * main thread — which serves Stop — never parses a large file.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { importCsvRun } from '../store/csv-import.ts';
import type { ImportJob, ImportJobResult } from './import-off-thread.ts';

const job = workerData as ImportJob;
importCsvRun(job).then(
  (meta) => parentPort?.postMessage({ ok: true, meta } satisfies ImportJobResult),
  (error: unknown) => parentPort?.postMessage({ ok: false, message: error instanceof Error ? error.message : String(error) } satisfies ImportJobResult),
);
