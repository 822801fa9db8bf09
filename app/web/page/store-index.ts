/**
 * Stand-in for main/store/index.ts in the page (see ../page-modules.ts): the
 * service's runs go to the page's OPFS store (../store/). The page entry
 * sets the store once at start; resuming a run and Node's file system do not
 * exist in a page and say so if reached.
 */
import type * as Original from '../../../main/store/index.ts';
import type { StoreFs } from '../../../main/store/store-fs.ts';
import type { CreateRunOptions, RunWriter } from '../../../main/store/writer-types.ts';
import type { PageDir } from '../store/page-dir.ts';
import { createPageRun } from '../store/page-run-writer.ts';
import type { PageRunStore } from '../store/page-run-store.ts';

export type { CreateRunOptions, RunWriter };

let current: { root: PageDir; store: PageRunStore } | null = null;

/** Where the service's new runs go (the page entry calls this before the service starts). */
export function usePageStore(root: PageDir, store: PageRunStore): void {
  current = { root, store };
}

export const createRun: typeof Original.createRun = async (options: CreateRunOptions): Promise<RunWriter> => {
  if (current === null) throw new Error('the page run store is not set up');
  const { root, store } = current;
  const writer = await createPageRun(root, options);
  store.writing.add(writer.id);
  const finish = writer.finish.bind(writer);
  return {
    ...writer,
    meta: () => writer.meta(),
    finish: async (status, extra) => {
      try {
        return await finish(status, extra);
      } finally {
        store.writing.delete(writer.id);
      }
    },
  };
};

export const reopenRun: typeof Original.reopenRun = async () => {
  throw new Error('resuming a drift log is not in the web edition; the run stays in the archive as interrupted');
};

const noNodeFs = (): never => {
  throw new Error('no machine file system in the web edition');
};

export const nodeStoreFs: StoreFs = {
  mkdir: noNodeFs,
  open: noNodeFs,
  readFile: noNodeFs,
  writeFile: noNodeFs,
  appendFile: noNodeFs,
  rename: noNodeFs,
  rm: noNodeFs,
  readdir: noNodeFs,
  stat: noNodeFs,
};

/** The page's OPFS store keeps no column cache: its runs open from their CSV (nothing to build at finish). */
export const cacheFinishedRun: typeof Original.cacheFinishedRun = () => Promise.resolve(false);
