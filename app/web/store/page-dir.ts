/**
 * The web edition's file system: one folder of the Origin Private File
 * System (navigator.storage.getDirectory()), reduced to what the page's run
 * store needs. OPFS commits a writable stream when it is closed and never
 * shows half of one, so each append is whole or absent; a tab killed between
 * two appends loses at most the rows not yet flushed (the writer flushes at
 * least once a second). A second implementation in memory serves the tests
 * (Node has no OPFS).
 */
export interface PageDir {
  /** The sub-folder `name`, made when `create`; null when it is absent. */
  dir(name: string, create: boolean): Promise<PageDir | null>;
  /** Entries of this folder, files and folders, sorted by name. */
  entries(): Promise<{ name: string; kind: 'file' | 'directory' }[]>;
  /** The file's bytes, or null when it does not exist. */
  readBytes(name: string): Promise<Uint8Array | null>;
  /** Replaces the file (made when absent) in one step. */
  writeBytes(name: string, bytes: Uint8Array): Promise<void>;
  /** Adds bytes at the end of the file (made when absent) in one step. */
  appendBytes(name: string, bytes: Uint8Array): Promise<void>;
  /** Removes a file or a folder with everything in it; absent is fine. */
  remove(name: string): Promise<void>;
}

const encoder = new TextEncoder();
const decoder = new TextDecoder('utf-8', { fatal: false });

export async function readText(dir: PageDir, name: string): Promise<string | null> {
  const bytes = await dir.readBytes(name);
  return bytes === null ? null : decoder.decode(bytes);
}

export function writeText(dir: PageDir, name: string, text: string): Promise<void> {
  return dir.writeBytes(name, encoder.encode(text));
}

export function appendText(dir: PageDir, name: string, text: string): Promise<void> {
  return dir.appendBytes(name, encoder.encode(text));
}

function isNotFound(error: unknown): boolean {
  return error instanceof DOMException && (error.name === 'NotFoundError' || error.name === 'TypeMismatchError');
}

/** Async iteration over a directory handle (Chromium has it; TypeScript's DOM lib leaves it out). */
interface IterableDirectory extends FileSystemDirectoryHandle {
  entries(): AsyncIterableIterator<[string, FileSystemHandle]>;
}

/** A PageDir over an OPFS directory handle. */
export function opfsDir(handle: FileSystemDirectoryHandle): PageDir {
  const fileHandle = async (name: string, create: boolean): Promise<FileSystemFileHandle | null> => {
    try {
      return await handle.getFileHandle(name, { create });
    } catch (error) {
      if (isNotFound(error)) return null;
      throw error;
    }
  };
  return {
    async dir(name, create) {
      try {
        return opfsDir(await handle.getDirectoryHandle(name, { create }));
      } catch (error) {
        if (isNotFound(error)) return null;
        throw error;
      }
    },
    async entries() {
      const found: { name: string; kind: 'file' | 'directory' }[] = [];
      for await (const [name, entry] of (handle as IterableDirectory).entries()) found.push({ name, kind: entry.kind });
      return found.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    },
    async readBytes(name) {
      const file = await fileHandle(name, false);
      return file === null ? null : new Uint8Array(await (await file.getFile()).arrayBuffer());
    },
    async writeBytes(name, bytes) {
      const file = (await fileHandle(name, true)) as FileSystemFileHandle;
      const writable = await file.createWritable({ keepExistingData: false });
      await writable.write(bytes as Uint8Array<ArrayBuffer>);
      await writable.close();
    },
    async appendBytes(name, bytes) {
      const file = (await fileHandle(name, true)) as FileSystemFileHandle;
      const size = (await file.getFile()).size;
      const writable = await file.createWritable({ keepExistingData: true });
      await writable.write({ type: 'write', position: size, data: bytes as Uint8Array<ArrayBuffer> });
      await writable.close();
    },
    async remove(name) {
      try {
        await handle.removeEntry(name, { recursive: true });
      } catch (error) {
        if (!isNotFound(error)) throw error;
      }
    },
  };
}

/** A PageDir held in memory (tests; a page without OPFS keeps its runs until it closes). */
export function memoryDir(): PageDir {
  const files = new Map<string, Uint8Array>();
  const dirs = new Map<string, PageDir>();
  return {
    async dir(name, create) {
      const found = dirs.get(name);
      if (found) return found;
      if (!create) return null;
      const made = memoryDir();
      dirs.set(name, made);
      return made;
    },
    async entries() {
      return [
        ...[...files.keys()].map((name) => ({ name, kind: 'file' as const })),
        ...[...dirs.keys()].map((name) => ({ name, kind: 'directory' as const })),
      ].sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    },
    readBytes: async (name) => files.get(name)?.slice() ?? null,
    async writeBytes(name, bytes) {
      files.set(name, bytes.slice());
    },
    async appendBytes(name, bytes) {
      const old = files.get(name) ?? new Uint8Array(0);
      const joined = new Uint8Array(old.length + bytes.length);
      joined.set(old);
      joined.set(bytes, old.length);
      files.set(name, joined);
    },
    async remove(name) {
      files.delete(name);
      dirs.delete(name);
    },
  };
}
