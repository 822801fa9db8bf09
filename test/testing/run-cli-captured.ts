/**
 * Runs the `tunebench` CLI in-process with its output captured, so a
 * command's test can check the exit code and exactly what it printed.
 */
import { runCli } from '../../main/cli/index.ts';

export interface CapturedCli {
  code: number;
  out: string;
  err: string;
}

/** `tunebench ...argv` with an empty environment; stdout and stderr collected as text. */
export async function runCliCaptured(...argv: string[]): Promise<CapturedCli> {
  let out = '';
  let err = '';
  const io = {
    stdout: { write: (s: string) => ((out += s), true) },
    stderr: { write: (s: string) => ((err += s), true) },
    env: {},
  };
  const code = await runCli(argv, io);
  return { code, out, err };
}
