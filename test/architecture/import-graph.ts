/**
 * The project's import graph, read from the sources (no bundler): every
 * relative `import`/`export … from` and dynamic `import('…')` of each .ts/.tsx
 * file under app/ and main/. Type-only imports are kept apart: they vanish at
 * run time, but they still say which layer knows which.
 */
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { dirname, join, relative, resolve } from 'node:path';

export interface ImportEdge {
  from: string;
  to: string;
  typeOnly: boolean;
}

const ROOTS = ['app', 'main'];
/** A Node built-in by name: `node:fs`, or the bare `fs`, `fs/promises`, `path`… */
const BUILTINS: ReadonlySet<string> = new Set(builtinModules.filter((name) => !name.startsWith('_')));

export function isNodeBuiltin(spec: string): boolean {
  return spec.startsWith('node:') || BUILTINS.has(spec) || BUILTINS.has(spec.split('/')[0] ?? '');
}

const IMPORT =
  /(?:^|\n)\s*(import|export)\s+(type\s+)?(?:[^'";]*?\s+from\s+)?['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g;

function sourceFiles(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    if (name === 'node_modules' || name.startsWith('.')) continue;
    const path = join(dir, name);
    if (statSync(path).isDirectory()) sourceFiles(path, out);
    else if (/\.(ts|tsx)$/.test(name) && !name.endsWith('.d.ts')) out.push(path);
  }
  return out;
}

/** Every source file (repo-relative, forward slashes) and its imports of other project files or of node: built-ins. */
export function importGraph(repo: string): {
  files: string[];
  edges: ImportEdge[];
  builtins: { from: string; module: string; typeOnly: boolean }[];
} {
  const files = ROOTS.flatMap((root) => sourceFiles(join(repo, root))).map((f) =>
    relative(repo, f).split('\\').join('/'),
  );
  const edges: ImportEdge[] = [];
  const builtins: { from: string; module: string; typeOnly: boolean }[] = [];
  for (const file of files) {
    const text = readFileSync(join(repo, file), 'utf8');
    for (const m of text.matchAll(IMPORT)) {
      const spec = m[3] ?? m[4] ?? '';
      if (isNodeBuiltin(spec)) builtins.push({ from: file, module: spec, typeOnly: m[2] !== undefined });
      if (!spec.startsWith('.')) continue;
      const to = relative(repo, resolve(join(repo, dirname(file)), spec))
        .split('\\')
        .join('/');
      edges.push({ from: file, to, typeOnly: m[2] !== undefined });
    }
  }
  return { files, edges, builtins };
}

/** Cycles among files (Tarjan's strongly connected components of more than one file, or a file importing itself). */
export function cycles(files: string[], edges: ImportEdge[]): string[][] {
  const next = new Map<string, string[]>(files.map((f) => [f, []]));
  for (const e of edges) next.get(e.from)?.push(e.to);
  let counter = 0;
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const found: string[][] = [];
  const visit = (v: string): void => {
    index.set(v, counter);
    low.set(v, counter);
    counter++;
    stack.push(v);
    onStack.add(v);
    for (const w of next.get(v) ?? []) {
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v) as number, low.get(w) as number));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v) as number, index.get(w) as number));
    }
    if (low.get(v) === index.get(v)) {
      const component: string[] = [];
      let w: string;
      do {
        w = stack.pop() as string;
        onStack.delete(w);
        component.push(w);
      } while (w !== v);
      if (component.length > 1 || (next.get(v) ?? []).includes(v)) found.push(component.sort());
    }
  };
  for (const f of files) if (!index.has(f)) visit(f);
  return found;
}
