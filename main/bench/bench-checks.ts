/**
 * What a bench file means, checked before any instrument is touched: the
 * tuning port and the DUT supply on two different channels, and every
 * channel one the supply's profile has. Each problem names its field(s).
 */
import type { BenchConfig } from '../../app/contract/plans.ts';

/** A bench that cannot be used as written; `fields` are the keys at fault. Exit 2 at the CLI. */
export class BenchCheckError extends Error {
  override readonly name = 'BenchCheckError';
  constructor(
    readonly fields: readonly string[],
    message: string,
  ) {
    super(message);
  }
}

/** Problems with the bench's channel use, one line each ("supply.controlChannel: …"). */
export function benchChannelProblems(
  bench: BenchConfig,
  supplyChannels?: { channels: number; profile: string },
): string[] {
  const { controlChannel, dutSupplyChannel } = bench.supply;
  const problems: string[] = [];
  if (controlChannel === dutSupplyChannel) {
    problems.push(
      `supply.controlChannel and supply.dutSupplyChannel: both are channel ${controlChannel}; the tuning port and the DUT supply need two different channels (defaults 1 and 2)`,
    );
  }
  if (supplyChannels !== undefined) {
    for (const [field, channel] of [
      ['controlChannel', controlChannel],
      ['dutSupplyChannel', dutSupplyChannel],
    ] as const) {
      if (channel > supplyChannels.channels) {
        problems.push(
          `supply.${field}: channel ${channel}, but profile ${supplyChannels.profile} has ${supplyChannels.channels} channel(s) (1..${supplyChannels.channels})`,
        );
      }
    }
  }
  return problems;
}

/** Throws BenchCheckError listing every problem. */
export function checkBenchChannels(
  bench: BenchConfig,
  supplyChannels?: { channels: number; profile: string },
  label = 'bench',
): void {
  const problems = benchChannelProblems(bench, supplyChannels);
  if (problems.length === 0) return;
  const fields = problems.map((line) => line.slice(0, line.indexOf(':')));
  throw new BenchCheckError(fields, `${label} is not valid:\n${problems.map((line) => `  ${line}`).join('\n')}`);
}
