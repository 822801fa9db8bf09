/** Thermometer role (a DMM or logger reading a probe) over a SCPI session; always °C out. */
import { ReplyFormatError } from './errors.ts';
import type { ThermometerProfile } from './profile-schema.ts';
import type { InstrumentIdentity, Thermometer } from './roles.ts';
import { parseFinite, parseIdentity } from './scpi-reply.ts';
import type { ScpiSession } from './scpi-session.ts';

/** Kelvin offset and Fahrenheit scale: SI Brochure / ITS-90 definitions (common practice). */
const TO_CELSIUS = {
  C: (t: number) => t,
  K: (t: number) => t - 273.15,
  F: (t: number) => ((t - 32) * 5) / 9,
} as const;

export class ThermometerDriver implements Thermometer {
  readonly role = 'thermometer' as const;
  private readonly command: string;

  constructor(
    readonly session: ScpiSession,
    readonly profile: ThermometerProfile,
  ) {
    this.command = profile.commands.readTemperature.render({});
  }

  async identify(): Promise<InstrumentIdentity> {
    return parseIdentity(await this.session.query(this.profile.commands.identify.render({})));
  }

  /** °C. An open probe (not-a-number reply) or a reading outside profile `plausibleC` is a ReplyFormatError, never a number. */
  async readTemperature(): Promise<number> {
    const reply = await this.session.query(this.command);
    const celsius = TO_CELSIUS[this.profile.unit](parseFinite(reply));
    const { min, max } = this.profile.plausibleC;
    if (!(celsius >= min && celsius <= max))
      throw new ReplyFormatError(`a temperature in ${min}..${max} °C (profile plausibleC)`, reply);
    return celsius;
  }

  close(): Promise<void> {
    return this.session.close();
  }
}

export function createThermometer(session: ScpiSession, profile: ThermometerProfile): Thermometer {
  return new ThermometerDriver(session, profile);
}
