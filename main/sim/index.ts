/**
 * Public API of the simulated bench (see each module for details).
 */
export { createSimBench, SUPPLY_CONTROL_CHANNEL, SUPPLY_DUT_CHANNEL } from './sim-bench.ts';
export type { SimBench, SimBenchOptions, SimBenchSnapshot } from './sim-bench.ts';
export { createSimTransport } from './sim-transport.ts';
export { serveDevice, serveSimBench } from './tcp-server.ts';
export type { ServedDevice, ServedSimBench, ServeSimBenchOptions } from './tcp-server.ts';
export { attachDeviceToStream, serveDeviceOnSerial } from './stream-adapter.ts';
export { faultSchema, faultScriptSchema, parseFaultScript, FaultScriptError } from './faults.ts';
export type { FaultScript, FaultSpec } from './faults.ts';
export { dutParamsSchema, parseDutParams, DutParamsError } from './dut-params.ts';
export type { DutParams, RelaxationDutParams, VaractorDutParams } from './dut-params.ts';
export { builtinDut, BUILTIN_DUT_NAMES, isBuiltinDutName } from './builtin-duts.ts';
export type { BuiltinDutName } from './builtin-duts.ts';
export { ambientProfileSchema, DEFAULT_AMBIENT } from './ambient.ts';
export type { AmbientProfile } from './ambient.ts';
export { SCPI_NAN_TEXT, COUNTER_IDENTITY } from './sim-counter.ts';
export type { NoSignalReply } from './sim-counter.ts';
export { SUPPLY_IDENTITY } from './sim-supply.ts';
export { THERMOMETER_IDENTITY } from './sim-thermometer.ts';
export type { SupplyChannelState } from './supply-channel.ts';
export { LineClient } from './line-client.ts';
