/**
 * `tunebench schema NAME`: prints the JSON Schema of one file format.
 */
import { FILE_SCHEMA_NAMES, isFileSchemaName, jsonSchemaText } from './file-schemas.ts';
import { parseFlags } from './flags.ts';
import { UsageError, type CliCommand } from './types.ts';

const usage = `usage: tunebench schema NAME

Prints the JSON Schema of one file format, for an editor to validate and
complete files with. NAME is one of: ${FILE_SCHEMA_NAMES.join(', ')}.
The same files ship in resources/schemas/; point a file's "$schema" key at one.
Every key with its unit, default and limits: resources/docs/reference.md.
`;

export const schemaCommand: CliCommand = {
  name: 'schema',
  usage,
  run(argv, io) {
    const flags = parseFlags(argv, {});
    const [name, extra] = flags.positionals;
    if (name === undefined || extra !== undefined)
      throw new UsageError(`expected one NAME: ${FILE_SCHEMA_NAMES.join(', ')}`);
    if (!isFileSchemaName(name))
      throw new UsageError(`"${name}" is not a file format; expected one of ${FILE_SCHEMA_NAMES.join(', ')}`);
    io.stdout.write(jsonSchemaText(name));
    return Promise.resolve(0);
  },
};
