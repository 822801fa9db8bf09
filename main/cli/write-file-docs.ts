/**
 * `npm run schemas`: rewrites resources/schemas/*.schema.json and the key
 * tables of resources/docs/reference.md from the zod schemas. Run it after changing a
 * file schema; a test fails until the committed files match.
 */
import { readFile, writeFile, mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { FILE_SCHEMA_NAMES, jsonSchemaText } from './file-schemas.ts';
import { regenerateReference } from './file-reference.ts';

const root = join(import.meta.dirname, '..', '..');
await mkdir(join(root, 'resources', 'schemas'), { recursive: true });
for (const name of FILE_SCHEMA_NAMES)
  await writeFile(join(root, 'resources', 'schemas', `${name}.schema.json`), jsonSchemaText(name));
const docPath = join(root, 'resources', 'docs', 'reference.md');
await writeFile(docPath, regenerateReference(await readFile(docPath, 'utf8')));
process.stdout.write(
  `wrote resources/schemas/ (${FILE_SCHEMA_NAMES.length} files) and the key tables of resources/docs/reference.md\n`,
);
