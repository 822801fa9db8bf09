/**
 * An instrument profile from its parsed JSON: validated, command templates
 * compiled. No file access here (./profile-loader.ts finds and reads the
 * files), so the web edition's page builds its drivers from the same rules.
 */
import type { z } from 'zod';
import { compileTemplate, type CommandTemplate } from './command-template.ts';
import { ProfileError } from './errors.ts';
import { PLACEHOLDERS, profileSchema, type InstrumentProfile } from './profile-schema.ts';
import type { RoleName } from './roles.ts';

/** The standard-SCPI profile name for a role. */
export function defaultProfileName(role: RoleName): string {
  return `${role}-scpi`;
}

/** Validates a parsed profile object and compiles its command templates. */
export function parseProfile(json: unknown, name: string): InstrumentProfile {
  const result = profileSchema.safeParse(json);
  if (!result.success) throw new ProfileError(name, describe(result.error));
  const data = result.data;
  const allowed: Record<string, readonly string[]> = PLACEHOLDERS[data.role];
  const commands: Record<string, CommandTemplate | undefined> = {};
  for (const [op, source] of Object.entries(data.commands)) {
    if (source === undefined) {
      commands[op] = undefined;
      continue;
    }
    try {
      commands[op] = compileTemplate(source, allowed[op] ?? []);
    } catch (error) {
      throw new ProfileError(name, `commands.${op}: ${(error as Error).message}`);
    }
  }
  data.init.forEach((source, i) => {
    try {
      compileTemplate(source, []);
    } catch (error) {
      throw new ProfileError(name, `init.${i}: ${(error as Error).message}`);
    }
  });
  // The zod output and the compiled map agree key by key (checked above), so the cast only joins them.
  return { ...data, name, commands } as unknown as InstrumentProfile;
}

function describe(error: z.ZodError): string {
  return error.issues
    .map((issue) => `${issue.path.length > 0 ? issue.path.join('.') : '(root)'}: ${issue.message}`)
    .join('; ');
}
