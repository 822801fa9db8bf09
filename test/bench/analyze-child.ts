/**
 * Child of the big-inputs bench: runs `tunebench analyze ARGS…` in this
 * process, discards what it prints (counting the bytes), and reports its own
 * CPU time and peak resident memory on stderr as one JSON line.
 */
import { runCli } from '../../main/cli/index.ts';

let outBytes = 0;
const io = {
  stdout: { write: (s: string) => ((outBytes += s.length), true) },
  stderr: { write: (s: string) => (process.stderr.write(s), true) },
  env: {},
};
const code = await runCli(['analyze', ...process.argv.slice(2)], io);
const usage = process.resourceUsage();
process.stderr.write(
  `${JSON.stringify({ code, outBytes, cpuMs: (usage.userCPUTime + usage.systemCPUTime) / 1000, maxRssMB: usage.maxRSS / 1024 })}\n`,
);
