/**
 * Where runs live. The app keeps them in its user-data folder; from the CLI:
 *   Linux    $XDG_DATA_HOME/tunebench/runs (default ~/.local/share/tunebench/runs)
 *   macOS    ~/Library/Application Support/tunebench/runs
 *   Windows  %APPDATA%\tunebench\runs (default ~\AppData\Roaming\tunebench\runs)
 * `--runs DIR` beats TUNEBENCH_RUNS, which beats the default. Pure: the
 * environment, platform and home folder are passed in.
 */
import { posix, win32 } from 'node:path';

export const APP_FOLDER = 'tunebench';

export function defaultRunsDir(
  env: Readonly<Record<string, string | undefined>>,
  platform: NodeJS.Platform,
  homedir: string,
): string {
  if (platform === 'win32') {
    const appData = nonEmpty(env.APPDATA) ?? win32.join(homedir, 'AppData', 'Roaming');
    return win32.join(appData, APP_FOLDER, 'runs');
  }
  if (platform === 'darwin') return posix.join(homedir, 'Library', 'Application Support', APP_FOLDER, 'runs');
  // XDG Base Directory Specification: a relative XDG_DATA_HOME is invalid and ignored.
  const xdg = nonEmpty(env.XDG_DATA_HOME);
  const dataHome = xdg !== undefined && posix.isAbsolute(xdg) ? xdg : posix.join(homedir, '.local', 'share');
  return posix.join(dataHome, APP_FOLDER, 'runs');
}

/** The runs folder for a command: the --runs flag, then TUNEBENCH_RUNS, then the default. */
export function resolveRunsDir(
  flag: string | undefined,
  env: Readonly<Record<string, string | undefined>>,
  platform: NodeJS.Platform,
  homedir: string,
): string {
  return nonEmpty(flag) ?? nonEmpty(env.TUNEBENCH_RUNS) ?? defaultRunsDir(env, platform, homedir);
}

function nonEmpty(text: string | undefined): string | undefined {
  return text === undefined || text.trim() === '' ? undefined : text;
}
