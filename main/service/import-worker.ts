/**
 * Worker thread body of a CSV import (./import-off-thread.ts): gathers the
 * text (whole, or as UTF-8 slices streamed from the page), then parses it and
 * writes the run folder with the store's own importCsvRun — so the main
 * thread, which serves Stop, never parses a large file. The same entry,
 * not niced then (import-worker-priority.ts), runs a big drift log's
 * analysis when its workerData is a drift job (./drift-analysis-off-thread.ts):
 * one worker entry in every build.
 */
import './import-worker-priority.ts'; // first: lowers this thread's priority before the rest loads
import { parentPort, workerData } from 'node:worker_threads';
import { importCsvRun } from '../store/csv-import.ts';
import type { ImportJobResult, ImportTarget, ToImportWorker } from './import-off-thread.ts';
import { runDriftAnalysis } from '../../app/analysis/drift-run-view.ts';
import type { DriftWorkerData } from './drift-analysis-off-thread.ts';

const data = workerData as ImportTarget | DriftWorkerData;
const target = data as ImportTarget;
const slices: Uint8Array[] = [];
let text: string | null = null;

function reply(result: ImportJobResult): void {
  parentPort?.postMessage(result);
}

function joinedText(): string {
  if (text !== null) return text;
  let total = 0;
  for (const slice of slices) total += slice.byteLength;
  const bytes = new Uint8Array(total);
  let at = 0;
  for (const slice of slices) {
    bytes.set(slice, at);
    at += slice.byteLength;
  }
  slices.length = 0;
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new Error(`${target.fileName}: not UTF-8 text`);
  }
}

if ('driftJob' in data) parentPort?.postMessage(runDriftAnalysis(data.driftJob));
else
  parentPort?.on('message', (message: ToImportWorker) => {
    if (message.kind === 'text') text = message.text;
    else if (message.kind === 'slice') slices.push(message.bytes);
    else {
      Promise.resolve()
        .then(() => importCsvRun({ ...target, csvText: joinedText() }))
        .then(
          (meta) => reply({ ok: true, meta }),
          (error: unknown) => reply({ ok: false, message: error instanceof Error ? error.message : String(error) }),
        );
    }
  });
