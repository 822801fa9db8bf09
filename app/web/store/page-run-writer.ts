/**
 * The page's run writer: the same run folder as the desktop store (run.json,
 * samples.csv, events.jsonl; CONTRACTS.md) in the Origin Private File System.
 * Rows and events are buffered and appended at least once a second of real
 * time (and on flush()), each append whole or absent (./page-dir.ts); the
 * readers drop a torn last line anyway, as on the desktop. On finish run.json
 * is re-read (a rename or note made during the run is kept) and replaced with
 * the final status.
 */
import type { RunMeta } from '../../contract/bench-api.ts';
import { formatCell } from '../../../main/store/csv-cells.ts';
import { dutIdSchema, makeRunId } from '../../../main/store/run-id.ts';
import { startingRunMeta } from '../../../main/store/starting-meta.ts';
import type { CreateRunOptions, RunWriter } from '../../../main/store/writer-types.ts';
import { appendText, readText, writeText, type PageDir } from './page-dir.ts';
import { parseStoredMeta, PAGE_FILES, TRASH_DIR } from './page-run-files.ts';

/** Real ms between automatic appends: rows reach OPFS at least this often. */
export const PAGE_FLUSH_MS = 1000;

/** A free run folder under `root` for `baseId` (-2, -3… when taken, here or in the trash). */
async function makeRunFolder(root: PageDir, baseId: string): Promise<{ id: string; dir: PageDir }> {
  const taken = new Set((await root.entries()).map((e) => e.name));
  const trash = await root.dir(TRASH_DIR, false);
  const trashed = new Set(trash ? (await trash.entries()).map((e) => e.name) : []);
  for (let n = 1; n < 1000; n++) {
    const id = n === 1 ? baseId : `${baseId}-${n}`;
    if (taken.has(id) || trashed.has(id)) continue;
    return { id, dir: (await root.dir(id, true)) as PageDir };
  }
  throw new Error(`cannot find a free run id for ${baseId}`);
}

export async function createPageRun(root: PageDir, options: CreateRunOptions): Promise<RunWriter> {
  const dutId = dutIdSchema.parse(options.dut.id);
  const startedAt = options.clock.wallTimeIso();
  const { id, dir } = await makeRunFolder(root, makeRunId(startedAt, dutId));
  let meta: RunMeta = startingRunMeta(options, { id, startedAt, dutId });
  const columns = options.columns;
  await writeText(dir, PAGE_FILES.samples, `${columns.join(',')}\n`);
  await writeText(dir, PAGE_FILES.events, '');
  await writeText(dir, PAGE_FILES.meta, `${JSON.stringify(meta, null, 2)}\n`);

  const t0 = options.clock.now();
  let samples = '';
  let events = '';
  let pendingRows = 0;
  let writtenRows = 0;
  let chain: Promise<void> = Promise.resolve();
  let finishing: Promise<RunMeta> | null = null;

  const writePending = (): Promise<void> => {
    const rows = samples;
    const lines = events;
    const count = pendingRows;
    samples = '';
    events = '';
    pendingRows = 0;
    chain = chain.then(async () => {
      if (rows !== '') await appendText(dir, PAGE_FILES.samples, rows);
      writtenRows += count;
      if (lines !== '') await appendText(dir, PAGE_FILES.events, lines);
    });
    return chain;
  };
  const timer = setInterval(() => {
    if (samples !== '' || events !== '') writePending().catch((error: unknown) => options.onError?.(error as Error));
  }, PAGE_FLUSH_MS);

  const elapsedS = (): number => options.clock.now() - t0;
  return {
    id,
    dir: `opfs:/runs/${id}`,
    columns,
    meta: () => meta,
    elapsedS,
    appendSample(row) {
      const cells = Array.isArray(row)
        ? columns.map((_, i) => formatCell((row as readonly (number | string | null | undefined)[])[i]))
        : columns.map((name) => formatCell((row as Readonly<Record<string, number | string | null>>)[name]));
      samples += `${cells.join(',')}\n`;
      pendingRows++;
    },
    appendEvent(event) {
      events += `${JSON.stringify({ ...event, time_s: event.time_s ?? elapsedS(), type: event.type })}\n`;
    },
    flush: () => writePending(),
    finish(status, extra) {
      finishing ??= (async () => {
        clearInterval(timer);
        await writePending();
        const stored = await readText(dir, PAGE_FILES.meta);
        const onDisk = stored === null ? meta : parseStoredMeta(stored, id);
        meta = { ...onDisk, ...extra, status, endedAt: options.clock.wallTimeIso() };
        await writeText(dir, PAGE_FILES.meta, `${JSON.stringify(meta, null, 2)}\n`);
        return meta;
      })();
      return finishing;
    },
    pendingRows: () => pendingRows,
    rowsWritten: () => writtenRows,
  };
}
