/**
 * Chamber role over a SCPI session, commands from a profile. The limits live
 * here, at the layer that writes: until `setLimits` has been called every
 * setpoint and ramp write is refused, and so is any value outside the limits.
 * A written setpoint is read back and compared, since what a chamber was told
 * is not what it took.
 */
import type { CommandTemplate } from './command-template.ts';
import { UnsupportedOperationError } from './errors.ts';
import type { ChamberProfile } from './profile-schema.ts';
import type { Chamber, ChamberCapabilities, ChamberLimits, InstrumentIdentity } from './roles.ts';
import { formatScpiNumber, parseBoolean, parseFinite, parseIdentity } from './scpi-reply.ts';
import type { ScpiSession } from './scpi-session.ts';

/** A chamber write refused before it was sent; names the field, the instrument and what would be valid. */
export class ChamberLimitError extends Error {
  override readonly name = 'ChamberLimitError';
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
  }
}

/** Checks the limits themselves (finite, min < max, rate > 0). */
export function checkChamberLimits(limits: ChamberLimits, field = 'chamber'): void {
  if (!Number.isFinite(limits.minC) || !Number.isFinite(limits.maxC) || !(limits.minC < limits.maxC)) {
    throw new ChamberLimitError(
      `${field}.minC`,
      `must be finite and below ${field}.maxC, got ${limits.minC} … ${limits.maxC} °C`,
    );
  }
  if (!(limits.maxRateCPerMin > 0) || !Number.isFinite(limits.maxRateCPerMin)) {
    throw new ChamberLimitError(
      `${field}.maxRateCPerMin`,
      `must be a finite rate > 0 °C/min, got ${limits.maxRateCPerMin}`,
    );
  }
}

/** The chamber did not take what it was told (setpoint read back differs). */
export class ChamberReadbackError extends Error {
  override readonly name = 'ChamberReadbackError';
}

export class ChamberDriver implements Chamber {
  readonly role = 'chamber' as const;
  readonly capabilities: ChamberCapabilities;
  readonly endAction: 'setpoint' | 'stop';
  #limits: ChamberLimits | null = null;
  private readonly writeOptions: { checkErrors: boolean };

  constructor(
    readonly session: ScpiSession,
    readonly profile: ChamberProfile,
    readonly address = 'chamber',
  ) {
    this.capabilities = { ...profile.capabilities };
    this.endAction = profile.endAction;
    this.writeOptions = { checkErrors: profile.checkErrorsAfterWrite };
  }

  async identify(): Promise<InstrumentIdentity> {
    return parseIdentity(await this.session.query(this.profile.commands.identify.render({})));
  }

  setLimits(limits: ChamberLimits): void {
    checkChamberLimits(limits);
    this.#limits = { ...limits };
  }

  async setSetpoint(celsius: number): Promise<void> {
    const limits = this.#limitsFor('setpoint');
    if (!Number.isFinite(celsius) || celsius < limits.minC || celsius > limits.maxC) {
      throw new ChamberLimitError(
        'setpoint',
        `${celsius} °C refused by the chamber (${this.address}, profile ${this.profile.name}); valid: ${limits.minC} … ${limits.maxC} °C (chamber.minC … chamber.maxC)`,
      );
    }
    await this.write(this.profile.commands.setSetpoint, { celsius: formatScpiNumber(celsius) });
    const readBack = await this.getSetpoint();
    if (Math.abs(readBack - celsius) > this.profile.setpointToleranceC) {
      throw new ChamberReadbackError(
        `chamber (${this.address}) reads its setpoint back as ${readBack} °C after ${celsius} °C was written`,
      );
    }
  }

  async getSetpoint(): Promise<number> {
    return parseFinite(await this.session.query(this.profile.commands.getSetpoint.render({})));
  }

  async readAirTemperature(): Promise<number> {
    return parseFinite(await this.session.query(this.profile.commands.readAirTemperature.render({})));
  }

  async setRampRate(cPerMin: number): Promise<void> {
    const template = this.capabilities.rampRate ? this.profile.commands.setRampRate : undefined;
    if (template === undefined) throw new UnsupportedOperationError('setRampRate', this.profile.name);
    const limits = this.#limitsFor('ramp rate');
    if (!(cPerMin > 0) || cPerMin > limits.maxRateCPerMin) {
      throw new ChamberLimitError(
        'rampRate',
        `${cPerMin} °C/min refused by the chamber (${this.address}); valid: > 0 … ${limits.maxRateCPerMin} °C/min (chamber.maxRateCPerMin)`,
      );
    }
    await this.write(template, { ratePerMin: formatScpiNumber(cPerMin) });
  }

  async setRunning(on: boolean): Promise<void> {
    const template = this.capabilities.runStop ? this.profile.commands.setRunning : undefined;
    if (template === undefined) throw new UnsupportedOperationError('setRunning', this.profile.name);
    await this.write(template, { state: on ? 'ON' : 'OFF' });
  }

  async getRunning(): Promise<boolean> {
    const template = this.capabilities.runStop ? this.profile.commands.getRunning : undefined;
    if (template === undefined) throw new UnsupportedOperationError('getRunning', this.profile.name);
    return parseBoolean(await this.session.query(template.render({})));
  }

  close(): Promise<void> {
    return this.session.close();
  }

  #limitsFor(what: string): ChamberLimits {
    if (this.#limits === null) {
      throw new ChamberLimitError(
        'chamber',
        `no limits set on the chamber (${this.address}); a ${what} write is refused until minC, maxC and maxRateCPerMin are given`,
      );
    }
    return this.#limits;
  }

  private write(template: CommandTemplate, values: Record<string, string>): Promise<void> {
    return this.session.write(template.render(values), this.writeOptions);
  }
}

export function createChamber(session: ScpiSession, profile: ChamberProfile, address?: string): Chamber {
  return new ChamberDriver(session, profile, address);
}
