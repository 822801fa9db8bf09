/**
 * A StoreFs over the real disk that fails on command: a write that writes
 * half its text and then throws (disk full mid-write), or a rename that
 * throws (the process dying between the temp write and the rename).
 */
import { type StoreFs, nodeStoreFs } from '../store-fs.ts';

export interface FaultPlan {
  /** Fail the next N writes to files whose path ends with this suffix. */
  failWrites?: { pathEndsWith: string; count: number };
  /** Fail renames onto paths ending with this suffix while set. */
  failRenameTo?: string;
}

export function faultyFs(plan: FaultPlan, base: StoreFs = nodeStoreFs): StoreFs {
  return {
    ...base,
    async open(path, flags) {
      const handle = await base.open(path, flags);
      return {
        ...handle,
        async write(text) {
          const fail = plan.failWrites;
          if (fail && fail.count > 0 && path.endsWith(fail.pathEndsWith)) {
            fail.count -= 1;
            // Half the text reaches the disk, then the device gives up.
            await handle.write(text.slice(0, Math.floor(text.length / 2)));
            throw Object.assign(new Error('ENOSPC: no space left on device (injected)'), { code: 'ENOSPC' });
          }
          return handle.write(text);
        },
      };
    },
    async rename(from, to) {
      if (plan.failRenameTo !== undefined && to.endsWith(plan.failRenameTo)) {
        throw Object.assign(new Error('process died before rename (injected)'), { code: 'EIO' });
      }
      return base.rename(from, to);
    },
  };
}
