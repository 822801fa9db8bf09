// Types of source-manifest.mjs for the TypeScript that imports it.
export interface SourceEntry {
  path: string;
  size: number;
  sha1: string;
}
export function writeSourceManifest(file: string, root: string, paths: string[]): void;
export function readSourceManifest(file: string): Map<string, SourceEntry> | null;
export function sourceChange(root: string, entry: SourceEntry, builtMs: number): string | null;
