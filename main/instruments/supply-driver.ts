/** Supply role over a SCPI session, commands from a profile. */
import { UnsupportedOperationError } from './errors.ts';
import type { CommandTemplate } from './command-template.ts';
import type { SupplyProfile } from './profile-schema.ts';
import type { InstrumentIdentity, Supply, SupplyCapabilities } from './roles.ts';
import { formatScpiNumber, parseBoolean, parseFinite, parseIdentity } from './scpi-reply.ts';
import type { ScpiSession } from './scpi-session.ts';

export class SupplyDriver implements Supply {
  readonly role = 'supply' as const;
  readonly capabilities: SupplyCapabilities;
  private readonly writeOptions: { checkErrors: boolean };

  constructor(readonly session: ScpiSession, readonly profile: SupplyProfile) {
    this.capabilities = { ...profile.capabilities };
    this.writeOptions = { checkErrors: profile.checkErrorsAfterWrite };
  }

  async identify(): Promise<InstrumentIdentity> {
    return parseIdentity(await this.session.query(this.profile.commands.identify.render({})));
  }

  async setVoltage(channel: number, volts: number): Promise<void> {
    return this.write(this.profile.commands.setVoltage, { channel: this.channel(channel), volts: formatScpiNumber(volts) });
  }

  async getVoltageSetpoint(channel: number): Promise<number> {
    return parseFinite(await this.query(this.profile.commands.getVoltageSetpoint, channel));
  }

  async setCurrentLimit(channel: number, amps: number): Promise<void> {
    return this.write(this.profile.commands.setCurrentLimit, { channel: this.channel(channel), amps: formatScpiNumber(amps) });
  }

  async setOverVoltageProtection(channel: number, volts: number): Promise<void> {
    const template = this.capabilities.overVoltageProtection ? this.profile.commands.setOverVoltageProtection : undefined;
    if (template === undefined) throw new UnsupportedOperationError('setOverVoltageProtection', this.profile.name);
    return this.write(template, { channel: this.channel(channel), volts: formatScpiNumber(volts) });
  }

  async setOutput(channel: number, on: boolean): Promise<void> {
    return this.write(this.profile.commands.setOutput, { channel: this.channel(channel), state: on ? 'ON' : 'OFF' });
  }

  async getOutput(channel: number): Promise<boolean> {
    return parseBoolean(await this.query(this.profile.commands.getOutput, channel));
  }

  async measureVoltage(channel: number): Promise<number> {
    const template = this.capabilities.measureVoltage ? this.profile.commands.measureVoltage : undefined;
    if (template === undefined) throw new UnsupportedOperationError('measureVoltage', this.profile.name);
    return parseFinite(await this.query(template, channel));
  }

  async measureCurrent(channel: number): Promise<number> {
    const template = this.capabilities.measureCurrent ? this.profile.commands.measureCurrent : undefined;
    if (template === undefined) throw new UnsupportedOperationError('measureCurrent', this.profile.name);
    return parseFinite(await this.query(template, channel));
  }

  close(): Promise<void> {
    return this.session.close();
  }

  private write(template: CommandTemplate, values: Record<string, string>): Promise<void> {
    return this.session.write(template.render(values), this.writeOptions);
  }

  private query(template: CommandTemplate, channel: number): Promise<string> {
    return this.session.query(template.render({ channel: this.channel(channel) }));
  }

  // Argument errors (channel, non-finite value) reject like any other failure.
  /** Channels are 1-based and limited to what the profile addresses. */
  private channel(channel: number): string {
    if (!Number.isInteger(channel) || channel < 1 || channel > this.capabilities.channels) {
      throw new RangeError(`channel: ${channel} is not 1..${this.capabilities.channels} for profile ${this.profile.name}`);
    }
    return String(channel);
  }
}

export function createSupply(session: ScpiSession, profile: SupplyProfile): Supply {
  return new SupplyDriver(session, profile);
}
