/**
 * Supply role over a SCPI session, commands from a profile. The lowest layer
 * that writes a supply, so it holds the channel ceilings (channel-ceilings.ts)
 * and refuses readbacks beyond the profile's ratings.
 */
import { ChannelCeilings } from './channel-ceilings.ts';
import { ReplyFormatError, UnsupportedOperationError } from './errors.ts';
import type { CommandTemplate } from './command-template.ts';
import type { SupplyProfile } from './profile-schema.ts';
import type { InstrumentIdentity, Supply, SupplyCapabilities, SupplyWriteOptions } from './roles.ts';
import { formatScpiNumber, parseBoolean, parseFinite, parseIdentity } from './scpi-reply.ts';
import type { ScpiSession } from './scpi-session.ts';

export class SupplyDriver implements Supply {
  readonly role = 'supply' as const;
  readonly capabilities: SupplyCapabilities;
  private readonly writeOptions: { checkErrors: boolean };
  private readonly ceilings = new ChannelCeilings();

  constructor(
    readonly session: ScpiSession,
    readonly profile: SupplyProfile,
  ) {
    this.capabilities = { ...profile.capabilities };
    this.writeOptions = { checkErrors: profile.checkErrorsAfterWrite };
  }

  async identify(): Promise<InstrumentIdentity> {
    return parseIdentity(await this.session.query(this.profile.commands.identify.render({})));
  }

  limitChannel(channel: number, purpose: 'control' | 'dut-supply', maxV: number): void {
    this.ceilings.set(Number(this.channel(channel)), purpose, maxV);
  }

  async setVoltage(channel: number, volts: number, options?: SupplyWriteOptions): Promise<void> {
    const ch = this.channel(channel);
    this.ceilings.check(channel, volts, `supply at ${this.session.address}`);
    return this.write(this.profile.commands.setVoltage, { channel: ch, volts: formatScpiNumber(volts) }, options);
  }

  async getVoltageSetpoint(channel: number): Promise<number> {
    return this.rated(await this.query(this.profile.commands.getVoltageSetpoint, channel), 'V');
  }

  async setCurrentLimit(channel: number, amps: number): Promise<void> {
    return this.write(this.profile.commands.setCurrentLimit, {
      channel: this.channel(channel),
      amps: formatScpiNumber(amps),
    });
  }

  async setOverVoltageProtection(channel: number, volts: number): Promise<void> {
    const template = this.capabilities.overVoltageProtection
      ? this.profile.commands.setOverVoltageProtection
      : undefined;
    if (template === undefined) throw new UnsupportedOperationError('setOverVoltageProtection', this.profile.name);
    return this.write(template, { channel: this.channel(channel), volts: formatScpiNumber(volts) });
  }

  async setOutput(channel: number, on: boolean, options?: SupplyWriteOptions): Promise<void> {
    return this.write(
      this.profile.commands.setOutput,
      { channel: this.channel(channel), state: on ? 'ON' : 'OFF' },
      options,
    );
  }

  async getOutput(channel: number): Promise<boolean> {
    return parseBoolean(await this.query(this.profile.commands.getOutput, channel));
  }

  async measureVoltage(channel: number): Promise<number> {
    const template = this.capabilities.measureVoltage ? this.profile.commands.measureVoltage : undefined;
    if (template === undefined) throw new UnsupportedOperationError('measureVoltage', this.profile.name);
    return this.rated(await this.query(template, channel), 'V');
  }

  async measureCurrent(channel: number): Promise<number> {
    const template = this.capabilities.measureCurrent ? this.profile.commands.measureCurrent : undefined;
    if (template === undefined) throw new UnsupportedOperationError('measureCurrent', this.profile.name);
    return this.rated(await this.query(template, channel), 'A');
  }

  close(): Promise<void> {
    return this.session.close();
  }

  private write(
    template: CommandTemplate,
    values: Record<string, string>,
    options?: SupplyWriteOptions,
  ): Promise<void> {
    const command = template.render(values);
    if (options?.urgent === true) return this.session.sendUrgent(command);
    return this.session.write(command, this.writeOptions);
  }

  /** A finite reading within the profile's ratings, else ReplyFormatError (a fault, never a value). */
  private rated(reply: string, unit: 'V' | 'A'): number {
    const value = parseFinite(reply);
    const limit = unit === 'V' ? this.profile.ratings.maxVoltageV : this.profile.ratings.maxCurrentA;
    if (Math.abs(value) > limit) {
      throw new ReplyFormatError(
        `a reading within ±${limit} ${unit} (profile ratings.${unit === 'V' ? 'maxVoltageV' : 'maxCurrentA'})`,
        reply,
      );
    }
    return value;
  }

  private query(template: CommandTemplate, channel: number): Promise<string> {
    return this.session.query(template.render({ channel: this.channel(channel) }));
  }

  // Argument errors (channel, non-finite value) reject like any other failure.
  /** Channels are 1-based and limited to what the profile addresses. */
  private channel(channel: number): string {
    if (!Number.isInteger(channel) || channel < 1 || channel > this.capabilities.channels) {
      throw new RangeError(
        `channel: ${channel} is not 1..${this.capabilities.channels} for profile ${this.profile.name}`,
      );
    }
    return String(channel);
  }
}

export function createSupply(session: ScpiSession, profile: SupplyProfile): Supply {
  return new SupplyDriver(session, profile);
}
