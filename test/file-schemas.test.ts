/**
 * The JSON Schemas in resources/schemas/ and the key tables of
 * resources/docs/reference.md are generated from the zod schemas (`npm run schemas`);
 * these checks fail when a schema changes and the shipped files do not.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { FILE_SCHEMA_NAMES, jsonSchemaText } from '../main/cli/file-schemas.ts';
import { regenerateReference } from '../main/cli/file-reference.ts';

const root = join(import.meta.dirname, '..');

describe('generated file formats', () => {
  it.each(FILE_SCHEMA_NAMES)('resources/schemas/%s.schema.json equals the schema generated from zod', (name) => {
    expect(readFileSync(join(root, 'resources', 'schemas', `${name}.schema.json`), 'utf8')).toBe(jsonSchemaText(name));
  });

  it('strict objects become additionalProperties: false, so an editor flags a misspelt key', () => {
    const bench = JSON.parse(jsonSchemaText('bench')) as {
      additionalProperties: boolean;
      properties: { supply: { additionalProperties: boolean } };
    };
    expect(bench.additionalProperties).toBe(false);
    expect(bench.properties.supply.additionalProperties).toBe(false);
  });

  it('resources/docs/reference.md holds the generated key tables of every format, and every key has a meaning', () => {
    const doc = readFileSync(join(root, 'resources', 'docs', 'reference.md'), 'utf8');
    expect(regenerateReference(doc)).toBe(doc);
    for (const name of FILE_SCHEMA_NAMES)
      expect(doc).toContain(
        `<!-- keys:${name} -->\n| key |`.replace('| key |', name === 'profile' || name === 'dut' ? '**' : '| key |'),
      );
    const keyRows = doc.split('\n').filter((line) => line.startsWith('| `'));
    expect(keyRows.length).toBeGreaterThan(100);
    for (const row of keyRows) expect(row, row).not.toMatch(/\|\s*\|$/);
  });

  it('shipped profiles and DUT models name their JSON Schema and load through their strict loaders', async () => {
    const { readdirSync, existsSync } = await import('node:fs');
    const { loadProfile } = await import('../main/instruments/profile-loader.ts');
    const { loadDutParamsFile } = await import('../main/cli/sim-files.ts');
    for (const [folder, schema] of [
      ['profiles', 'profile'],
      ['duts', 'dut'],
    ] as const) {
      for (const name of readdirSync(join(root, 'resources', folder)).filter((f) => f.endsWith('.json'))) {
        const file = join(root, 'resources', folder, name);
        const ref = (JSON.parse(readFileSync(file, 'utf8')) as { $schema?: string }).$schema;
        expect(ref, name).toBe(`../schemas/${schema}.schema.json`);
        expect(existsSync(join(root, 'resources', folder, ref as string))).toBe(true);
        if (folder === 'profiles')
          await expect(loadProfile(name.replace(/\.json$/, ''))).resolves.toMatchObject({
            schema: 'tunebench.profile/1',
          });
        else await expect(loadDutParamsFile(file)).resolves.toMatchObject({ id: expect.any(String) });
      }
    }
  });

  it('README links the user reference, and the reference names every address form and the check command', () => {
    expect(readFileSync(join(root, 'README.md'), 'utf8')).toMatch(/\]\(resources\/docs\/reference\.md\)/);
    const doc = readFileSync(join(root, 'resources', 'docs', 'reference.md'), 'utf8');
    for (const form of [
      'tcp://HOST:PORT',
      'TCPIP[n]::HOST::PORT::SOCKET',
      'serial:PATH?options',
      'ASRL<PATH>::INSTR',
      'tunebench check [--bench FILE]',
      'maxControlV` + 10 %',
      'defaults 9600 baud',
    ]) {
      expect(doc).toContain(form);
    }
  });
});
