/** The version recorded in run.json `software.version`, from package.json. */
import packageJson from '../../package.json' with { type: 'json' };

export const SOFTWARE_VERSION: string = packageJson.version;
