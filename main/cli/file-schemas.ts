/**
 * The JSON Schemas of the files a user writes — bench, sweep/drift/pushing
 * plans, instrument profiles, DUT models — generated from the zod schemas
 * that check them (z.toJSONSchema, input side: what may be written, before
 * "250m" becomes 0.25). Shipped in resources/schemas/ for editors, printed
 * by `tunebench schema NAME`; a test keeps the shipped files equal to these.
 */
import { z } from 'zod';
import { benchConfigSchema, driftPlanSchema, pushingPlanSchema, sweepPlanSchema } from '../../app/contract/plans.ts';
import { campaignPlanSchema } from '../../app/contract/campaign-plan.ts';
import { profileSchema } from '../instruments/profile-schema.ts';
import { dutParamsSchema } from '../sim/dut-params.ts';

export const FILE_SCHEMAS = {
  bench: {
    schema: benchConfigSchema,
    title: 'tunebench bench file: addresses and profiles of the supply, counter and thermometer',
  },
  'sweep-plan': { schema: sweepPlanSchema, title: 'tunebench sweep plan' },
  'drift-plan': { schema: driftPlanSchema, title: 'tunebench drift plan' },
  'pushing-plan': { schema: pushingPlanSchema, title: 'tunebench pushing plan' },
  'campaign-plan': {
    schema: campaignPlanSchema,
    title: 'tunebench campaign plan: temperatures, supply corners and units, soak, chamber limits and the sweep',
  },
  profile: { schema: profileSchema, title: 'tunebench instrument profile (tunebench.profile/1)' },
  dut: { schema: dutParamsSchema, title: 'tunebench simulated DUT model' },
} as const satisfies Record<string, { schema: z.ZodType; title: string }>;

export type FileSchemaName = keyof typeof FILE_SCHEMAS;
export const FILE_SCHEMA_NAMES = Object.keys(FILE_SCHEMAS) as FileSchemaName[];

export function isFileSchemaName(name: string): name is FileSchemaName {
  return Object.hasOwn(FILE_SCHEMAS, name);
}

/** The JSON Schema (draft 2020-12) of one file format. */
export function jsonSchemaOf(name: FileSchemaName): Record<string, unknown> {
  const { schema, title } = FILE_SCHEMAS[name];
  const generated = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any', target: 'draft-2020-12' });
  const { $schema, ...rest } = generated;
  return { $schema, $id: `${name}.schema.json`, title, ...rest };
}

/** The file as shipped in resources/schemas/NAME.schema.json. */
export function jsonSchemaText(name: FileSchemaName): string {
  return `${JSON.stringify(jsonSchemaOf(name), null, 2)}\n`;
}
