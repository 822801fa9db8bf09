/**
 * Issue 16 item 2: the code the web edition's page runs imports no Node
 * built-in. main/procedures, main/sim and the role drivers (with everything
 * the drivers import) reach files only through an injected file system (the
 * store's StoreFs) or leave file reading to the command line. An import of
 * `node:*` or of a bare built-in name (`fs`, `path`, `fs/promises`…) there
 * fails here, naming the file and the module.
 *
 * `import type` is allowed: it is erased at compile time and loads nothing
 * (main/sim/stream-adapter.ts names Node's Duplex type that way). Globals
 * such as `Buffer` are not imports and are not checked here; the page
 * provides Buffer from the npm `buffer` package.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { PAGE_MODULES } from '../../app/web/page-modules.ts';
import { importGraph, isNodeBuiltin, type ImportEdge } from './import-graph.ts';

const REPO = fileURLToPath(new URL('../..', import.meta.url));

/** Folders whose every module must be free of Node built-ins. */
const NODE_FREE_FOLDERS = ['main/procedures/', 'main/sim/'];
/** The role drivers; what they import by value is held to the same rule. */
const ROLE_DRIVERS = [
  'main/instruments/supply-driver.ts',
  'main/instruments/counter-driver.ts',
  'main/instruments/thermometer-driver.ts',
  'main/instruments/chamber-driver.ts',
];
/**
 * Node-facing modules inside those folders, each with why it may stay:
 * the page never loads them (the page-graph test below would name them).
 */
const NODE_FACES: Record<string, string> = {
  'main/sim/tcp-server.ts': 'serves the simulated bench on TCP ports for `tunebench sim`; the page uses sim-transport',
};

const isTest = (file: string): boolean => /\.test\.tsx?$/.test(file) || file.includes('/testing/');

/** Files reachable from `roots` through value imports (type-only imports load nothing). */
export function valueClosure(roots: readonly string[], edges: readonly ImportEdge[]): Set<string> {
  const next = new Map<string, string[]>();
  for (const edge of edges) {
    if (edge.typeOnly) continue;
    const list = next.get(edge.from) ?? [];
    list.push(edge.to);
    next.set(edge.from, list);
  }
  const seen = new Set<string>();
  const stack = [...roots];
  while (stack.length > 0) {
    const file = stack.pop() as string;
    if (seen.has(file)) continue;
    seen.add(file);
    stack.push(...(next.get(file) ?? []));
  }
  return seen;
}

/** The value imports of Node built-ins among `files`, as "file → module" lines. */
export function nodeImportsIn(
  files: ReadonlySet<string>,
  builtins: readonly { from: string; module: string; typeOnly: boolean }[],
): string[] {
  return builtins.filter((b) => files.has(b.from) && !b.typeOnly).map((b) => `${b.from} → ${b.module}`);
}

describe('Node-free code for the web edition (issue 16 item 2)', () => {
  const graph = importGraph(REPO);

  it('main/procedures and main/sim import no Node built-in (Node faces named and excused)', () => {
    const files = new Set(
      graph.files.filter(
        (f) => NODE_FREE_FOLDERS.some((folder) => f.startsWith(folder)) && !isTest(f) && !(f in NODE_FACES),
      ),
    );
    expect(files.size).toBeGreaterThan(40);
    expect(nodeImportsIn(files, graph.builtins)).toEqual([]);
  });

  it('the role drivers and everything they import by value import no Node built-in', () => {
    const files = valueClosure(ROLE_DRIVERS, graph.edges);
    expect(files.has('main/instruments/scpi-reply.ts')).toBe(true);
    expect(nodeImportsIn(files, graph.builtins)).toEqual([]);
  });

  it('the Web Serial transport and everything it imports by value import no Node built-in (the page loads it)', () => {
    const files = valueClosure(['main/instruments/web-serial-transport.ts'], graph.edges);
    expect(files.has('main/instruments/web-serial-options.ts')).toBe(true);
    expect(files.has('main/instruments/web-serial-ports.ts')).toBe(true);
    expect(nodeImportsIn(files, graph.builtins)).toEqual([]);
    // Nor Node-only globals: the transport needs no Buffer stand-in in the page.
    const nodeGlobals = [...files].filter((file) =>
      /\b(Buffer\.|process\.|setImmediate\(|require\()/.test(readFileSync(join(REPO, file), 'utf8')),
    );
    expect(nodeGlobals).toEqual([]);
  });

  it('every excused Node face still exists and still needs the excuse', () => {
    for (const file of Object.keys(NODE_FACES)) {
      expect(graph.files).toContain(file);
      expect(nodeImportsIn(new Set([file]), graph.builtins).length).toBeGreaterThan(0);
    }
  });

  it("the web edition's page, from its entry, loads no Node built-in once the stand-ins replace their originals", () => {
    const edges = graph.edges.map((edge) => ({ ...edge, to: PAGE_MODULES[edge.to] ?? edge.to }));
    const page = valueClosure(['app/web/main.tsx'], edges);
    expect(page.has('main/service/bench-service.ts')).toBe(true);
    expect(page.has('main/procedures/sweep.ts')).toBe(true);
    for (const original of Object.keys(PAGE_MODULES)) expect(page.has(original)).toBe(false);
    // The npm `buffer` package stands in for Node's Buffer global (app/web/buffer-global.ts).
    const npmBuffer = (b: { from: string; module: string }): boolean =>
      b.from === 'app/web/buffer-global.ts' && b.module === 'buffer';
    expect(
      nodeImportsIn(
        page,
        graph.builtins.filter((b) => !npmBuffer(b)),
      ),
    ).toEqual([]);
  });

  it('catches what it claims to: node: and bare names, value imports only', () => {
    expect(['node:fs', 'fs', 'fs/promises', 'path', 'node:stream'].every(isNodeBuiltin)).toBe(true);
    expect(['zod', './fs.ts', '../path/x.ts', 'uplot'].some(isNodeBuiltin)).toBe(false);
    const builtins = [
      { from: 'main/sim/a.ts', module: 'fs/promises', typeOnly: false },
      { from: 'main/sim/b.ts', module: 'node:stream', typeOnly: true },
    ];
    expect(nodeImportsIn(new Set(['main/sim/a.ts', 'main/sim/b.ts']), builtins)).toEqual([
      'main/sim/a.ts → fs/promises',
    ]);
    const edges: ImportEdge[] = [
      { from: 'd.ts', to: 'e.ts', typeOnly: false },
      { from: 'e.ts', to: 'f.ts', typeOnly: true },
    ];
    expect([...valueClosure(['d.ts'], edges)].sort()).toEqual(['d.ts', 'e.ts']);
  });
});
