/**
 * IEEE 488.2 common commands and SYSTem:ERRor, shared by every simulated
 * instrument (IEEE 488.2 §10 and SCPI-99 vol. 2 §21.8 — from memory).
 */

/** What the common commands need of a device (ScpiDevice has it); declared here so this module does not import the device that imports it. */
export interface CommonCommandHost {
  readonly identity: string;
  reset(): void;
  clearStatus(): void;
  setOpc(): void;
  readEsr(): number;
  popError(): string;
  /** Standard event status enable register (*ESE), 0–255. */
  ese: number;
}

/** The part of a command's context the common commands use (ScpiDevice's CommandContext has it). */
export interface CommonCommandArgs {
  number(index: number, spec: { min: number; max: number }, field: string): number;
}

/** A command without parameters (assignable to ScpiDevice's CommandDef). */
export interface CommonCommand {
  pattern: string;
  set?: (args: CommonCommandArgs) => void;
  query?: () => string;
}

export function commonCommands(device: CommonCommandHost): CommonCommand[] {
  return [
    { pattern: '*IDN', query: () => device.identity },
    { pattern: '*RST', set: () => device.reset() },
    { pattern: '*CLS', set: () => device.clearStatus() },
    { pattern: '*OPC', set: () => device.setOpc(), query: () => '1' },
    { pattern: '*ESR', query: () => String(device.readEsr()) },
    {
      pattern: '*ESE',
      set: (ctx: CommonCommandArgs) => {
        device.ese = Math.round(ctx.number(0, { min: 0, max: 255 }, '*ESE'));
      },
      query: () => String(device.ese),
    },
    { pattern: '*WAI', set: () => undefined },
    { pattern: '*TST', query: () => '0' },
    { pattern: 'SYSTem:ERRor[:NEXT]', query: () => device.popError() },
    { pattern: 'SYSTem:VERSion', query: () => '1999.0' },
  ];
}
