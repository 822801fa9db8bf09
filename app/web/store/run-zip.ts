/**
 * Run folders as zip files, so a run moves between the web edition, the
 * desktop app and the CLI unchanged: export writes `<id>/run.json`,
 * `<id>/samples.csv` and `<id>/events.jsonl` as they are stored; import
 * takes every folder in a zip that holds a run.json (a folder zipped by the
 * operating system included), checks run.json against its schema, and adds
 * the three files under the run's own id. Other files (a desktop
 * writer.lock, a column cache) are left out; an existing run is never
 * overwritten.
 */
import type { RunMeta } from '../../contract/bench-api.ts';
import { assertRunId } from '../../../main/store/run-id.ts';
import { readZip, writeZip, ZipError, type ZipEntry } from '../zip/zip-file.ts';
import type { PageDir } from './page-dir.ts';
import { parseStoredMeta, PAGE_FILES } from './page-run-files.ts';
import type { PageRunStore } from './page-run-store.ts';

const RUN_FILES: readonly string[] = [PAGE_FILES.meta, PAGE_FILES.samples, PAGE_FILES.events];

export async function exportRunZip(store: PageRunStore, id: string): Promise<{ fileName: string; bytes: Uint8Array }> {
  const safe = assertRunId(id);
  const dir = await store.folder(safe);
  const entries: ZipEntry[] = [];
  for (const file of RUN_FILES) {
    const bytes = await dir.readBytes(file);
    if (bytes !== null) entries.push({ name: `${safe}/${file}`, bytes });
  }
  return { fileName: `${safe}.zip`, bytes: writeZip(entries) };
}

export async function importRunZip(
  root: PageDir,
  store: PageRunStore,
  fileName: string,
  bytes: Uint8Array,
): Promise<RunMeta[]> {
  const entries = await readZip(bytes);
  const folders = new Map<string, Map<string, Uint8Array>>();
  for (const entry of entries) {
    const slash = entry.name.lastIndexOf('/');
    const folder = slash < 0 ? '' : entry.name.slice(0, slash);
    const file = entry.name.slice(slash + 1);
    if (!RUN_FILES.includes(file)) continue;
    const files = folders.get(folder) ?? new Map<string, Uint8Array>();
    files.set(file, entry.bytes);
    folders.set(folder, files);
  }
  const runs = [...folders].filter(([, files]) => files.has(PAGE_FILES.meta));
  if (runs.length === 0) throw new ZipError(`${fileName}: no run folder in it (a folder holding run.json)`);
  const known = new Set((await store.list()).map((run) => run.id));
  const imported: RunMeta[] = [];
  for (const [folder, files] of runs) {
    const where = `${fileName}: ${folder === '' ? '(top level)' : folder}`;
    const meta = parseStoredMeta(new TextDecoder().decode(files.get(PAGE_FILES.meta)), where);
    const id = assertRunId(meta.id);
    if (known.has(id)) throw new ZipError(`${where}: a run ${id} is already in the archive; it was not overwritten`);
    if (!files.has(PAGE_FILES.samples)) throw new ZipError(`${where}: samples.csv is missing`);
    const dir = (await root.dir(id, true)) as PageDir;
    for (const [file, content] of files) await dir.writeBytes(file, content);
    if (!files.has(PAGE_FILES.events)) await dir.writeBytes(PAGE_FILES.events, new Uint8Array(0));
    known.add(id);
    imported.push(meta);
  }
  return imported;
}
