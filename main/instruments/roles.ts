/**
 * Role drivers: what a procedure may ask of an instrument, independent of
 * its command dialect. A profile (resources/profiles/*.json) maps each
 * operation to command strings. Modelled on the capability split of the open
 * IVI instrument classes (DC power, counter, DMM). Units are SI.
 */

export interface InstrumentIdentity {
  /** Raw `*IDN?` reply, trimmed. */
  idn: string;
  manufacturer: string;
  model: string;
  serial: string;
  firmware: string;
}

export interface SupplyCapabilities {
  /** Number of output channels the profile addresses. */
  channels: number;
  /** Can read back measured output voltage (MEASure:VOLTage?). */
  measureVoltage: boolean;
  measureCurrent: boolean;
  overVoltageProtection: boolean;
}

/** How a supply write is sent. */
export interface SupplyWriteOptions {
  /**
   * Send at once, ahead of any queued command and of any resync, without
   * reading the error queue: the safe state's first try on a link whose
   * replies may have wedged. Verify by readback afterwards.
   */
  urgent?: boolean;
}

export interface Supply {
  readonly role: 'supply';
  readonly capabilities: SupplyCapabilities;
  identify(): Promise<InstrumentIdentity>;
  /**
   * Declares `purpose`'s voltage ceiling on `channel` (the lower holds when
   * two purposes share a channel). From then on setVoltage refuses, with
   * ChannelLimitError and before anything is sent, a value above it.
   */
  limitChannel(channel: number, purpose: 'control' | 'dut-supply', maxV: number): void;
  /** Setpoint in volts on `channel` (1-based). */
  setVoltage(channel: number, volts: number, options?: SupplyWriteOptions): Promise<void>;
  /** Reads the programmed setpoint back (SOURce:VOLTage?). */
  getVoltageSetpoint(channel: number): Promise<number>;
  setCurrentLimit(channel: number, amps: number): Promise<void>;
  /** Throws UnsupportedOperationError when capabilities.overVoltageProtection is false. */
  setOverVoltageProtection(channel: number, volts: number): Promise<void>;
  setOutput(channel: number, on: boolean, options?: SupplyWriteOptions): Promise<void>;
  getOutput(channel: number): Promise<boolean>;
  measureVoltage(channel: number): Promise<number>;
  measureCurrent(channel: number): Promise<number>;
  close(): Promise<void>;
}

/**
 * One counter reading. "No oscillation" is not a link fault: a counter shows
 * it as the SCPI not-a-number (9.91E37), as zero, or by not answering within
 * the measurement timeout. All three map to `no-signal`.
 */
export type FrequencyReading =
  { status: 'ok'; frequencyHz: number } | { status: 'no-signal'; cause: 'not-a-number' | 'zero' | 'timeout' };

export interface Counter {
  readonly role: 'counter';
  identify(): Promise<InstrumentIdentity>;
  /** Gate (aperture) time in seconds; the ±1-count resolution is 1/gate Hz. */
  setGate(seconds: number): Promise<void>;
  readonly gateS: number;
  /** Gates this counter takes, s (its profile's minGateS/maxGateS); DEFAULT_GATE_RANGE_S when absent. */
  readonly gateRangeS?: { minS: number; maxS: number };
  readFrequency(): Promise<FrequencyReading>;
  close(): Promise<void>;
}

/** Gate range assumed for a counter whose profile declares none: 1 µs to 10 s. */
export const DEFAULT_GATE_RANGE_S = { minS: 1e-6, maxS: 10 } as const;

export interface Thermometer {
  readonly role: 'thermometer';
  identify(): Promise<InstrumentIdentity>;
  /** Temperature in °C. */
  readTemperature(): Promise<number>;
  close(): Promise<void>;
}

export interface ChamberCapabilities {
  /** The chamber takes a ramp-rate limit (°C/min). */
  rampRate: boolean;
  /** The chamber can be switched to run and to stop (conditioning off). */
  runStop: boolean;
}

/** Limits a chamber driver holds before it writes any setpoint or ramp rate. */
export interface ChamberLimits {
  minC: number;
  maxC: number;
  maxRateCPerMin: number;
}

/**
 * A temperature chamber: setpoint, air temperature, ramp rate, run/stop.
 * The DUT thermometer, not the chamber's air sensor, is the soak reference.
 * The driver refuses every setpoint or ramp write until limits are set, and
 * any value outside them: safety sits at the layer that writes.
 */
export interface Chamber {
  readonly role: 'chamber';
  readonly capabilities: ChamberCapabilities;
  /** What the chamber does at the end of a campaign: go to a setpoint, or stop (per profile). */
  readonly endAction: 'setpoint' | 'stop';
  identify(): Promise<InstrumentIdentity>;
  setLimits(limits: ChamberLimits): void;
  /** Setpoint in °C; read back and checked. */
  setSetpoint(celsius: number): Promise<void>;
  getSetpoint(): Promise<number>;
  /** Air temperature at the chamber's own sensor, °C. */
  readAirTemperature(): Promise<number>;
  /** Ramp-rate limit, °C/min. Throws UnsupportedOperationError when capabilities.rampRate is false. */
  setRampRate(cPerMin: number): Promise<void>;
  /** Conditioning on (run) or off (stop). Throws UnsupportedOperationError when capabilities.runStop is false. */
  setRunning(on: boolean): Promise<void>;
  getRunning(): Promise<boolean>;
  close(): Promise<void>;
}

export type RoleName = 'supply' | 'counter' | 'thermometer' | 'chamber';
