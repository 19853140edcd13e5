/**
 * Quadrille's configuration: the environment parsed once through one schema (./schema.ts).
 * The server checks it before it listens (scripts/serve.mjs, `npm start`), so a bad value stops
 * the start with a message naming the variable instead of failing the first request that reads it.
 */
import { configSchema, settingSchemas, type Config, type SettingName } from './schema';

export { configSchema, settingDocs, settingSchemas, type Config, type SettingName } from './schema';

type Environment = Record<string, string | undefined>;

/** One variable's problem, as a person reads it: `PORT must be a whole number ..., got "x"`. */
export interface ConfigProblem {
  variable: string;
  problem: string;
}

/** A configuration that does not parse; `variable` is the first bad one, `problems` all of them. */
export class ConfigError extends Error {
  readonly variable: string;
  constructor(readonly problems: ConfigProblem[]) {
    super(problems.map((p) => `${p.variable} ${p.problem}`).join('; '));
    this.name = 'ConfigError';
    this.variable = problems[0]?.variable ?? '';
  }
}

// Read through a local alias so the bundler cannot replace process.env.X with build-time values.
const environment: Environment = process.env;
let cached: Config | null = null;

/** Parses `source` (default: this process's environment) without caching; throws ConfigError. */
export function parseConfig(source: Environment = environment): Config {
  const parsed = configSchema.safeParse(source);
  if (parsed.success) return parsed.data;
  throw new ConfigError(parsed.error.issues.map((issue) => ({ variable: String(issue.path[0] ?? '?'), problem: issue.message })));
}

/** The configuration of this process, parsed on first use and kept. */
export function config(): Config {
  cached ??= parseConfig(environment);
  return cached;
}

/** Forgets the kept configuration, so the next config() reads process.env again (tests). */
export function resetConfig(): void {
  cached = null;
}

/** One variable alone, for readers (the CLI) that must not fail on another part's setting. */
export function readSetting<N extends SettingName>(name: N, source: Environment = environment): Config[N] {
  const parsed = settingSchemas[name].safeParse(source[name]);
  if (parsed.success) return parsed.data as Config[N];
  throw new ConfigError(parsed.error.issues.map((issue) => ({ variable: name, problem: issue.message })));
}

/** The text printed when the configuration stops a start. */
export function describeConfigError(error: ConfigError): string {
  const lines = error.problems.map((p) => `  ${p.variable} ${p.problem}`);
  return `Quadrille cannot start: the configuration is invalid.\n${lines.join('\n')}\nSee "Configuration" in README.md.`;
}

/**
 * Checks the environment before the server starts: returns the configuration, or prints what is
 * wrong and ends the process with exit code 78 (EX_CONFIG).
 */
export function checkConfigAtStart(): Config {
  try {
    return config();
  } catch (error) {
    if (!(error instanceof ConfigError)) throw error;
    process.stderr.write(`${describeConfigError(error)}\n`);
    process.exit(78);
  }
}
