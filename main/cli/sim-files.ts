/**
 * The simulated bench's files read from disk (a fault script, a DUT model):
 * the reading lives here on the command line's side, so main/sim itself
 * stays free of Node built-ins and runs in the web edition's page too.
 */
import { readFile } from 'node:fs/promises';
import { parseBoundedJson } from '../../app/contract/bounded-json.ts';
import { DutParamsError, parseDutParams, type DutParams } from '../sim/dut-params.ts';
import { FaultScriptError, parseFaultScript, type FaultScript } from '../sim/faults.ts';

export async function loadFaultScriptFile(path: string): Promise<FaultScript> {
  let json: unknown;
  try {
    json = JSON.parse(await readFile(path, 'utf8'));
  } catch (error) {
    throw new FaultScriptError(`${path}: cannot read fault script (${(error as Error).message})`);
  }
  return parseFaultScript(json, path);
}

export async function loadDutParamsFile(path: string): Promise<DutParams> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    throw new DutParamsError(`${path}: cannot read DUT file (${(error as Error).message})`);
  }
  let json: unknown;
  try {
    json = parseBoundedJson(text);
  } catch (error) {
    throw new DutParamsError(`${path}: ${(error as Error).message}`);
  }
  return parseDutParams(json, path);
}
