import { describe, expect, it } from 'vitest';
import { defaultRunsDir, resolveRunsDir } from './runs-dir.ts';

describe('defaultRunsDir', () => {
  it('follows the XDG Base Directory Specification on Linux', () => {
    expect(defaultRunsDir({}, 'linux', '/home/ana')).toBe('/home/ana/.local/share/tunebench/runs');
    expect(defaultRunsDir({ XDG_DATA_HOME: '/data/ana' }, 'linux', '/home/ana')).toBe('/data/ana/tunebench/runs');
    // The spec says a relative XDG_DATA_HOME is invalid and must be ignored.
    expect(defaultRunsDir({ XDG_DATA_HOME: 'rel/dir' }, 'linux', '/home/ana')).toBe(
      '/home/ana/.local/share/tunebench/runs',
    );
  });

  it('uses Application Support on macOS and %APPDATA% on Windows (the Electron userData convention)', () => {
    expect(defaultRunsDir({}, 'darwin', '/Users/ana')).toBe('/Users/ana/Library/Application Support/tunebench/runs');
    expect(defaultRunsDir({ APPDATA: 'C:\\Users\\ana\\AppData\\Roaming' }, 'win32', 'C:\\Users\\ana')).toBe(
      'C:\\Users\\ana\\AppData\\Roaming\\tunebench\\runs',
    );
    expect(defaultRunsDir({}, 'win32', 'C:\\Users\\ana')).toBe('C:\\Users\\ana\\AppData\\Roaming\\tunebench\\runs');
  });

  it('lets --runs beat TUNEBENCH_RUNS beat the default', () => {
    const env = { TUNEBENCH_RUNS: '/lab/runs' };
    expect(resolveRunsDir('/tmp/r', env, 'linux', '/home/ana')).toBe('/tmp/r');
    expect(resolveRunsDir(undefined, env, 'linux', '/home/ana')).toBe('/lab/runs');
    expect(resolveRunsDir(undefined, {}, 'linux', '/home/ana')).toBe('/home/ana/.local/share/tunebench/runs');
  });
});
