/**
 * The page's runs folder in OPFS, as the service's RunStorePort: list, open
 * (through the store's own readers: readSampleTable and parseEventsJsonl,
 * which drop a torn last line), rename, note, delete to the trash and
 * restore. A run left `running` by a page that is gone reads as
 * `interrupted`, as on the desktop.
 */
import type { RunDetail, RunMeta } from '../../contract/bench-api.ts';
import { eventLineAfter, parseEventsJsonl } from '../../../main/store/events-jsonl.ts';
import { assertRunId, dutIdSchema } from '../../../main/store/run-id.ts';
import { readSampleTable } from '../../../main/store/sample-table.ts';
import type { RunStorePort } from '../../../main/service/ports.ts';
import { readText, writeText, type PageDir } from './page-dir.ts';
import { parseStoredMeta, PAGE_FILES, TRASH_DIR } from './page-run-files.ts';

export interface PageRunStore extends RunStorePort {
  /** The folder of one run (export reads it). */
  folder(id: string): Promise<PageDir>;
  /** Runs this page is writing now (the rest of the `running` ones were left by a closed page). */
  readonly writing: Set<string>;
}

function noteOf(text: string): string {
  const note = text.trim();
  if (note === '' || note.length > 10_000 || /[\u0000-\u0008\u000b-\u001f\u007f]/.test(note))
    throw new Error('note: expected 1 to 10000 characters of text without control characters');
  return note;
}

export function createPageRunStore(root: PageDir): PageRunStore {
  const writing = new Set<string>();

  const folder = async (id: string): Promise<PageDir> => {
    const safe = assertRunId(id);
    const dir = await root.dir(safe, false);
    if (dir === null || (await dir.readBytes(PAGE_FILES.meta)) === null) throw new Error(`no run "${safe}" here`);
    return dir;
  };

  const readMeta = async (dir: PageDir, id: string): Promise<RunMeta> => {
    const text = await readText(dir, PAGE_FILES.meta);
    if (text === null) throw new Error(`${id}: run.json is missing`);
    const meta = parseStoredMeta(text, id);
    if (meta.status !== 'running' || writing.has(meta.id)) return meta;
    // Its page closed mid-run: show it as interrupted and record that once.
    const shown: RunMeta = { ...meta, status: 'interrupted' };
    await writeText(dir, PAGE_FILES.meta, `${JSON.stringify(shown, null, 2)}\n`);
    return shown;
  };

  const listIn = async (parent: PageDir): Promise<RunMeta[]> => {
    const runs: RunMeta[] = [];
    for (const entry of await parent.entries()) {
      if (entry.kind !== 'directory' || entry.name.startsWith('.')) continue;
      const dir = await parent.dir(entry.name, false);
      if (dir === null) continue;
      try {
        runs.push(await readMeta(dir, entry.name));
      } catch {
        // Not a run folder (or a broken one): left out of the list, as the desktop's problems list does.
      }
    }
    return runs.sort((a, b) =>
      a.startedAt === b.startedAt ? b.id.localeCompare(a.id) : a.startedAt < b.startedAt ? 1 : -1,
    );
  };

  const copyFolder = async (from: PageDir, to: PageDir): Promise<void> => {
    for (const entry of await from.entries()) {
      if (entry.kind !== 'file') continue;
      const bytes = await from.readBytes(entry.name);
      if (bytes !== null) await to.writeBytes(entry.name, bytes);
    }
  };

  return {
    writing,
    folder,
    list: () => listIn(root),
    async open(id): Promise<RunDetail> {
      const dir = await folder(id);
      const meta = await readMeta(dir, id);
      const samples = readSampleTable((await readText(dir, PAGE_FILES.samples)) ?? '');
      const { events } = parseEventsJsonl((await readText(dir, PAGE_FILES.events)) ?? '');
      return { meta, samples, events };
    },
    async rename(id, dutId) {
      const dir = await folder(id);
      const meta = await readMeta(dir, id);
      const renamed: RunMeta = { ...meta, dut: { ...meta.dut, id: dutIdSchema.parse(dutId) } };
      await writeText(dir, PAGE_FILES.meta, `${JSON.stringify(renamed, null, 2)}\n`);
      return renamed;
    },
    async addNote(id, text) {
      const note = noteOf(text);
      const dir = await folder(id);
      const eventsText = (await readText(dir, PAGE_FILES.events)) ?? '';
      const { events } = parseEventsJsonl(eventsText);
      const lastS = events.reduce((t, e) => (Number.isFinite(e.time_s) ? Math.max(t, e.time_s) : t), 0);
      const event = { time_s: lastS, type: 'note', text: note, at: new Date().toISOString() };
      await writeText(dir, PAGE_FILES.events, eventsText + eventLineAfter(eventsText, event));
      const meta = await readMeta(dir, id);
      const notes = meta.dut.notes === '' ? note : `${meta.dut.notes}\n${note}`;
      await writeText(dir, PAGE_FILES.meta, `${JSON.stringify({ ...meta, dut: { ...meta.dut, notes } }, null, 2)}\n`);
    },
    async delete(id) {
      const dir = await folder(id);
      const meta = await readMeta(dir, id);
      if (meta.status === 'running') throw new Error(`run ${id} is still being recorded; stop it first`);
      const trash = (await root.dir(TRASH_DIR, true)) as PageDir;
      if ((await trash.dir(meta.id, false)) !== null)
        throw new Error(`the trash already holds a run ${id}; restore it first`);
      await copyFolder(dir, (await trash.dir(meta.id, true)) as PageDir);
      await root.remove(meta.id);
    },
    async restore(id) {
      const safe = assertRunId(id);
      const trash = await root.dir(TRASH_DIR, false);
      const source = trash === null ? null : await trash.dir(safe, false);
      if (trash === null || source === null) throw new Error(`no run "${safe}" in the trash`);
      if ((await root.dir(safe, false)) !== null)
        throw new Error(`a run ${safe} already exists; it was not overwritten`);
      const target = (await root.dir(safe, true)) as PageDir;
      await copyFolder(source, target);
      await trash.remove(safe);
      return readMeta(target, safe);
    },
    async importCsv() {
      throw new Error('CSV import is not in the web edition yet: import a run folder as a zip, or use the desktop app');
    },
  };
}
