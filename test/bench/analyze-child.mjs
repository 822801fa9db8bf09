/**
 * Child of the big-inputs bench: runs `tunebench analyze ARGS…` in this
 * process the way the `tunebench` launcher does (the prebuilt bundle when it
 * is current, else the sources through tsx), discards what it prints
 * (counting the characters), and reports on stderr as one JSON line its own
 * CPU time, peak resident memory and which of the two ran.
 */
import { bundleStaleReason, loadBundle } from '../../main/bin/cli-bundle.mjs';

async function loadRunCli() {
  const stale = process.env.TUNEBENCH_FROM_SOURCE === '1' ? 'TUNEBENCH_FROM_SOURCE=1' : bundleStaleReason();
  if (stale === null) return { runCli: loadBundle().exports.runCli, launch: 'bundle' };
  const { register } = await import('tsx/esm/api');
  register();
  const { runCli } = await import('../../main/cli/index.ts');
  return { runCli, launch: `tsx (${stale})` };
}

const { runCli, launch } = await loadRunCli();
let outBytes = 0;
const io = {
  stdout: { write: (s) => ((outBytes += s.length), true) },
  stderr: { write: (s) => (process.stderr.write(s), true) },
  env: {},
};
const code = await runCli(['analyze', ...process.argv.slice(2)], io);
const usage = process.resourceUsage();
process.stderr.write(
  `${JSON.stringify({ code, outBytes, launch, cpuMs: (usage.userCPUTime + usage.systemCPUTime) / 1000, maxRssMB: usage.maxRSS / 1024 })}\n`,
);
