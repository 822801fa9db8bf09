/**
 * IEEE 488.2 common commands and SYSTem:ERRor, shared by every simulated
 * instrument (IEEE 488.2 §10 and SCPI-99 vol. 2 §21.8 — from memory).
 */
import type { CommandDef, ScpiDevice } from './scpi-device.ts';

export function commonCommands(device: ScpiDevice): CommandDef[] {
  return [
    { pattern: '*IDN', query: () => device.identity },
    { pattern: '*RST', set: () => device.reset() },
    { pattern: '*CLS', set: () => device.clearStatus() },
    { pattern: '*OPC', set: () => device.setOpc(), query: () => '1' },
    { pattern: '*ESR', query: () => String(device.readEsr()) },
    {
      pattern: '*ESE',
      set: (ctx) => {
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
