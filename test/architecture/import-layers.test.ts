/**
 * The layers of ARCHITECTURE.md and DEVELOPERS.md, checked on the real import
 * graph (issue 10 item 9): an import that points up the layers, from app/ into
 * main/, of a Node built-in into the renderer, or any import cycle fails here,
 * naming the file and the import. Tests may reach up (an integration test of
 * the procedures assembles a bench); everything else may not.
 */
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { cycles, importGraph, type ImportEdge } from './import-graph.ts';

const REPO = fileURLToPath(new URL('../..', import.meta.url));

/**
 * Rank of each place, bottom up: a module may import only from its own folder
 * or from a place of lower rank. main: time → instruments (transports, SCPI,
 * roles) → sim and store → procedures → bench assembly → service → the
 * carriers (IPC, browser server, the window's options) → the CLI and the
 * Electron shell → the entry points. app: contract → analysis → bridge →
 * state → plots, workers, styles → views → the renderer's entry and dev tools.
 */
const RANKS: readonly [prefix: string, rank: number][] = [
  // The web edition's page (app/web/): an entry point over app/ and main/, like main/index.ts for the
  // desktop; listed first so its prefix wins, and the only part of app/ that may import main/.
  ['app/web/', 9],
  ['app/contract/', 0],
  ['app/analysis/', 1],
  ['app/bridge/', 2],
  ['app/state/', 3],
  ['app/plots/', 4],
  ['app/workers/', 4],
  ['app/styles/', 4],
  ['app/views/', 5],
  ['app/dev/', 6],
  ['app/main.tsx', 6],
  ['main/time/', 0],
  ['main/content-security-policy.ts', 0],
  ['main/instruments/', 1],
  ['main/sim/', 2],
  ['main/store/', 2],
  ['main/procedures/', 3],
  ['main/bench/', 4],
  ['main/service/', 5],
  ['main/ipc/', 6],
  ['main/server/', 6],
  ['main/window-options.ts', 6],
  ['main/cli/', 7],
  ['main/desktop/', 7],
  ['main/preload-api.ts', 7],
  ['main/index.ts', 8],
  ['main/preload.ts', 8],
];

function place(file: string): { prefix: string; rank: number } | null {
  for (const [prefix, rank] of RANKS) if (file === prefix || file.startsWith(prefix)) return { prefix, rank };
  return null;
}

const isTest = (file: string): boolean => /\.test\.tsx?$/.test(file) || file.includes('/testing/');

/** Why an import breaks the layers, or null when it is fine. */
export function layerViolation(edge: ImportEdge): string | null {
  const { from, to } = edge;
  if (!to.startsWith('app/') && !to.startsWith('main/')) return null; // resources, package.json
  if (from.startsWith('app/') && !from.startsWith('app/web/') && to.startsWith('main/'))
    return 'the renderer side (app/) imports main/';
  if (
    from.startsWith('main/') &&
    to.startsWith('app/') &&
    !to.startsWith('app/contract/') &&
    !to.startsWith('app/analysis/')
  ) {
    return 'main/ may use only app/contract and app/analysis of app/';
  }
  const a = place(from);
  const b = place(to);
  if (!a || !b || a.prefix === b.prefix || from.split('/')[0] !== to.split('/')[0]) return null;
  return b.rank < a.rank ? null : `points up the layers (${a.prefix} rank ${a.rank} → ${b.prefix} rank ${b.rank})`;
}

describe('import layers (ARCHITECTURE.md)', () => {
  const graph = importGraph(REPO);

  it('every source file sits in a known layer', () => {
    expect(graph.files.filter((f) => !isTest(f) && place(f) === null && !f.endsWith('.config.ts'))).toEqual([]);
  });

  it('no import points up the layers or across from app/ into main/', () => {
    const bad = graph.edges
      .filter((e) => !isTest(e.from))
      .flatMap((e) => {
        const why = layerViolation(e);
        return why ? [`${e.from} → ${e.to}: ${why}`] : [];
      });
    expect(bad).toEqual([]);
  });

  it('the renderer side imports no Node built-ins (tests and build configs aside)', () => {
    // app/web/buffer-global.ts imports the npm `buffer` package (same name as Node's module); the page's
    // whole import graph, stand-ins applied, is checked by node-free.test.ts.
    const bad = graph.builtins.filter(
      (b) =>
        b.from.startsWith('app/') &&
        !isTest(b.from) &&
        !b.from.endsWith('.config.ts') &&
        b.from !== 'app/web/buffer-global.ts',
    );
    expect(bad).toEqual([]);
  });

  it('has no import cycles, type-only imports included', () => {
    expect(cycles(graph.files, graph.edges)).toEqual([]);
  });

  it('catches what it claims to (the check itself can fail)', () => {
    expect(layerViolation({ from: 'app/views/x.tsx', to: 'main/store/index.ts', typeOnly: false })).toMatch(
      /imports main/,
    );
    expect(
      layerViolation({ from: 'app/web/page-bench.ts', to: 'main/service/bench-service.ts', typeOnly: false }),
    ).toBeNull();
    expect(layerViolation({ from: 'main/bench/x.ts', to: 'main/cli/flags.ts', typeOnly: false })).toMatch(/points up/);
    expect(layerViolation({ from: 'app/plots/p.ts', to: 'app/views/units.ts', typeOnly: false })).toMatch(/points up/);
    expect(layerViolation({ from: 'main/server/h.ts', to: 'main/window-options.ts', typeOnly: false })).toMatch(
      /points up/,
    );
    expect(layerViolation({ from: 'app/state/s.ts', to: 'main/store/run-id.ts', typeOnly: true })).toMatch(
      /app\/\) imports main/,
    );
    expect(layerViolation({ from: 'main/cli/c.ts', to: 'main/bench/assemble.ts', typeOnly: false })).toBeNull();
    expect(
      cycles(
        ['a.ts', 'b.ts', 'c.ts'],
        [
          { from: 'a.ts', to: 'b.ts', typeOnly: true },
          { from: 'b.ts', to: 'a.ts', typeOnly: false },
        ],
      ),
    ).toEqual([['a.ts', 'b.ts']]);
  });
});
