/**
 * Bring-up by hand: the control channel set outside any run, under the same
 * rules a procedure keeps. Limits are checked before any write, current
 * limit and over-voltage protection are applied before the output turns on,
 * and what the supply was told is read back, not assumed.
 */
import type { ManualControlRequest } from '../../app/contract/bench-api.ts';
import { applyLimits, checkControlV, checkLimits } from '../procedures/limits.ts';
import type { BenchRoles } from '../procedures/types.ts';
import { setpointMatches } from '../instruments/setpoint-match.ts';
import { BenchApiError } from './errors.ts';

export interface ManualResult {
  controlSetV: number;
  output: boolean;
}

export async function applyManualControl(roles: BenchRoles, request: ManualControlRequest): Promise<ManualResult> {
  const { limits } = request;
  checkLimits(limits, { controlV: 0, outputOff: true });
  checkControlV('request.controlV', request.controlV, limits);
  const channel = roles.controlChannel;
  const supply = roles.supply;
  if (request.output) {
    await applyLimits(supply, channel, limits);
    await supply.setVoltage(channel, request.controlV);
    await supply.setOutput(channel, true);
  } else {
    // Off first, then the level: the DUT never sees a new voltage while it is being switched off.
    await supply.setOutput(channel, false);
    await supply.setVoltage(channel, request.controlV);
  }
  const controlSetV = await supply.getVoltageSetpoint(channel);
  const output = await supply.getOutput(channel);
  if (!setpointMatches(controlSetV, request.controlV) || output !== request.output) {
    throw new BenchApiError(
      `supply (channel ${channel}) did not take the setting: asked ${request.controlV} V, output ${request.output ? 'on' : 'off'}; read back ${controlSetV} V, output ${output ? 'on' : 'off'}`,
      'request.controlV',
    );
  }
  return { controlSetV, output };
}
