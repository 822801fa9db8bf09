/**
 * Per-channel voltage ceilings kept by the supply driver itself, so no
 * procedure (and no bug in one) can put a channel above its own limit: the
 * tuning port never above maxControlV, the DUT supply never above its OVP
 * level. Each purpose declares its ceiling; when two purposes land on one
 * channel the lower ceiling holds. A write above it is refused before any
 * byte goes to the instrument.
 */
import { ChannelLimitError } from './errors.ts';

/** What a channel is used for; each declares its own ceiling. */
export type ChannelPurpose = 'control' | 'dut-supply';

const FIELD: Record<ChannelPurpose, string> = { control: 'limits.maxControlV', 'dut-supply': 'DUT supply OVP level' };

export class ChannelCeilings {
  private readonly byChannel = new Map<number, Map<ChannelPurpose, number>>();

  /** Declares (or replaces) `purpose`'s ceiling on `channel`, V. */
  set(channel: number, purpose: ChannelPurpose, maxV: number): void {
    if (!Number.isFinite(maxV))
      throw new RangeError(`channel ${channel} ceiling: expected a finite voltage, got ${maxV}`);
    const purposes = this.byChannel.get(channel) ?? new Map<ChannelPurpose, number>();
    purposes.set(purpose, maxV);
    this.byChannel.set(channel, purposes);
  }

  /** The ceiling that holds on `channel` (the lowest declared), or null when none is. */
  ceiling(channel: number): { maxV: number; purpose: ChannelPurpose } | null {
    let best: { maxV: number; purpose: ChannelPurpose } | null = null;
    for (const [purpose, maxV] of this.byChannel.get(channel) ?? []) {
      if (best === null || maxV < best.maxV) best = { maxV, purpose };
    }
    return best;
  }

  /** Throws ChannelLimitError when `volts` on `channel` would pass its ceiling. */
  check(channel: number, volts: number, instrument: string): void {
    const limit = this.ceiling(channel);
    if (limit === null || volts <= limit.maxV) return;
    throw new ChannelLimitError(
      channel,
      volts,
      limit.maxV,
      `${instrument}: refused to set channel ${channel} to ${volts} V, above its ceiling ${limit.maxV} V (${FIELD[limit.purpose]}); nothing was written`,
    );
  }
}
