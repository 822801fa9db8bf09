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
}

/** A command without parameters (assignable to ScpiDevice's CommandDef). */
export interface CommonCommand {
  pattern: string;
  set?: () => void;
  query?: () => string;
}

export function commonCommands(device: CommonCommandHost): CommonCommand[] {
  return [
    { pattern: '*IDN', query: () => device.identity },
    { pattern: '*RST', set: () => device.reset() },
    { pattern: '*CLS', set: () => device.clearStatus() },
    { pattern: '*OPC', set: () => device.setOpc(), query: () => '1' },
    { pattern: '*ESR', query: () => String(device.readEsr()) },
    { pattern: '*WAI', set: () => undefined },
    { pattern: '*TST', query: () => '0' },
    { pattern: 'SYSTem:ERRor[:NEXT]', query: () => device.popError() },
    { pattern: 'SYSTem:VERSion', query: () => '1999.0' },
  ];
}
