/** Turns the per-role connection choices into a bench config (CONTRACTS.md address forms). */
import { benchConfigSchema, type BenchConfig } from '../../contract/plans.ts';

export type RoleName = 'supply' | 'counter' | 'thermometer';
export type RoleMode = 'serial' | 'tcp' | 'sim' | 'none';

export interface RoleDraft {
  mode: RoleMode;
  serialPath: string;
  baud: string;
  tcpAddress: string;
  profile: string;
}

export const DEFAULT_ROLE_DRAFTS: Record<RoleName, RoleDraft> = {
  supply: { mode: 'sim', serialPath: '', baud: '9600', tcpAddress: '127.0.0.1:5025', profile: '' },
  counter: { mode: 'sim', serialPath: '', baud: '115200', tcpAddress: '127.0.0.1:5026', profile: '' },
  thermometer: { mode: 'sim', serialPath: '', baud: '9600', tcpAddress: '127.0.0.1:5027', profile: '' },
};

export type RoleErrors = Partial<Record<string, string>>;

function address(role: RoleName, draft: RoleDraft, errors: RoleErrors): string | null {
  switch (draft.mode) {
    case 'sim':
      return 'sim';
    case 'none':
      return null;
    case 'serial':
      if (draft.serialPath.trim() === '') errors[`${role}.address`] = 'pick a serial port';
      if (!/^\d+$/.test(draft.baud.trim())) errors[`${role}.baud`] = 'baud rate must be a whole number, e.g. 9600';
      return `serial:${draft.serialPath.trim()}?baud=${draft.baud.trim()}`;
    case 'tcp':
      if (!/^[A-Za-z0-9.\-[\]:]+:\d{1,5}$/.test(draft.tcpAddress.trim()))
        errors[`${role}.address`] = 'expected HOST:PORT, e.g. 127.0.0.1:5025';
      return `tcp://${draft.tcpAddress.trim()}`;
  }
}

export function buildBenchConfig(drafts: Record<RoleName, RoleDraft>): {
  config: BenchConfig | null;
  errors: RoleErrors;
} {
  const errors: RoleErrors = {};
  const entry = (role: RoleName) => {
    const draft = drafts[role];
    const at = address(role, draft, errors);
    if (at === null) return undefined;
    return draft.profile ? { address: at, profile: draft.profile } : { address: at };
  };
  const input = { supply: entry('supply'), counter: entry('counter'), thermometer: entry('thermometer') };
  if (!input.supply) errors['supply.address'] = 'the supply is required';
  if (!input.counter) errors['counter.address'] = 'the counter is required';
  const parsed = benchConfigSchema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) errors[issue.path.join('.')] ??= issue.message;
  }
  return Object.keys(errors).length > 0 || !parsed.success ? { config: null, errors } : { config: parsed.data, errors };
}
