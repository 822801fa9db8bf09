/**
 * Is each instrument the role the bench file gives it? Two checks at
 * connect, before anything is written: each `*IDN?` against words a role's
 * instruments use, and the supply's first replies (its control channel's
 * output state and setpoint, read through the profile). A supply that cannot
 * answer them, or identities that read like each other's roles, are refused
 * with a suggestion (most often: supply and counter addresses swapped).
 */
import type { RoleName, Supply } from '../instruments/roles.ts';
import { BenchCheckError } from './bench-checks.ts';

/** The control channel as found at connect. */
export interface ControlFound {
  channel: number;
  outputOn: boolean;
  setpointV: number;
}

/** Words that show up in identities of each role's instruments (tunebench's own heuristic). */
const ROLE_WORDS: Record<RoleName, RegExp> = {
  supply: /supply|power|psu|\bps\b|source/i,
  counter: /counter|frequency|timer|\bcnt\b/i,
  thermometer: /therm|temperature|logger|multimeter|\bdmm\b/i,
  chamber: /chamber|climatic|environmental|\boven\b/i,
};

/** Roles an identity reads like (empty when it says nothing either way). */
export function rolesSuggestedBy(idn: string): RoleName[] {
  return (Object.keys(ROLE_WORDS) as RoleName[]).filter((role) => ROLE_WORDS[role].test(idn));
}

export async function probeRoles(
  supply: Supply,
  controlChannel: number,
  instruments: readonly { role: string; idn: string; address: string }[],
): Promise<ControlFound> {
  const misfits = instruments.filter(({ role, idn }) => {
    const suggested = rolesSuggestedBy(idn);
    return suggested.length > 0 && !suggested.includes(role as RoleName);
  });
  let found: ControlFound | null = null;
  let probeError: string | null = null;
  try {
    found = {
      channel: controlChannel,
      outputOn: await supply.getOutput(controlChannel),
      setpointV: await supply.getVoltageSetpoint(controlChannel),
    };
  } catch (error) {
    probeError = error instanceof Error ? error.message : String(error);
  }
  if (found !== null && misfits.length === 0) return found;
  throw new BenchCheckError(
    misfits.map((m) => `${m.role}.address`).concat(probeError !== null ? ['supply.address'] : []),
    describeMisfit(instruments, misfits, probeError),
  );
}

function describeMisfit(
  instruments: readonly { role: string; idn: string; address: string }[],
  misfits: readonly { role: string; idn: string; address: string }[],
  probeError: string | null,
): string {
  const lines: string[] = [];
  const supply = instruments.find((i) => i.role === 'supply');
  if (probeError !== null && supply !== undefined) {
    lines.push(
      `supply at ${supply.address} did not answer its output state and setpoint as a supply does (${probeError}); its *IDN? is "${supply.idn}"`,
    );
  }
  for (const m of misfits) {
    lines.push(
      `${m.role} at ${m.address} identifies as "${m.idn}", which reads like a ${rolesSuggestedBy(m.idn).join(' or ')}, not a ${m.role}`,
    );
  }
  // Suggest the swap when another role's instrument reads like this role (or the supply probe failed on a counter).
  const swaps = new Set<string>();
  for (const m of [...misfits, ...(probeError !== null && supply ? [supply] : [])]) {
    for (const other of instruments) {
      if (other === m) continue;
      const mLooksLikeOther = rolesSuggestedBy(m.idn).includes(other.role as RoleName);
      const otherLooksLikeM = rolesSuggestedBy(other.idn).includes(m.role as RoleName);
      if (mLooksLikeOther || otherLooksLikeM)
        swaps.add(
          [m.role, other.role]
            .sort()
            .map((r) => `${r}.address`)
            .join(' and '),
        );
    }
  }
  for (const pair of swaps) lines.push(`the addresses look swapped: exchange ${pair} in the bench file`);
  if (swaps.size === 0)
    lines.push(
      "check each role's address and profile in the bench file (`tunebench check --bench FILE` tests them without writing)",
    );
  return `bench refused before any write:\n${lines.map((line) => `  ${line}`).join('\n')}`;
}
