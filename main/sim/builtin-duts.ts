/**
 * The two DUTs shipped in resources/duts/, by short name. Imported as JSON
 * modules so bundlers carry them; validated like any user file.
 */
import relaxationJson from '../../resources/duts/sensor-interface-relaxation.json' with { type: 'json' };
import varactorJson from '../../resources/duts/radio-lo-varactor-400m.json' with { type: 'json' };
import { parseDutParams, type DutParams } from './dut-params.ts';

export const BUILTIN_DUT_NAMES = ['relaxation', 'varactor'] as const;
export type BuiltinDutName = (typeof BUILTIN_DUT_NAMES)[number];

export function builtinDut(name: BuiltinDutName): DutParams {
  return name === 'relaxation'
    ? parseDutParams(relaxationJson, 'resources/duts/sensor-interface-relaxation.json')
    : parseDutParams(varactorJson, 'resources/duts/radio-lo-varactor-400m.json');
}

export function isBuiltinDutName(name: string): name is BuiltinDutName {
  return (BUILTIN_DUT_NAMES as readonly string[]).includes(name);
}
