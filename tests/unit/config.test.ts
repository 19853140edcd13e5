/**
 * The one configuration schema (src/lib/config): defaults, byte sizes, a bad value of each kind
 * naming its variable, the read-once cache, and the README's tables listing exactly its variables.
 * Expected byte counts are hand-computed powers of two (IEC 80000-13: 1 MiB = 2^20 B, 1 GiB = 2^30 B).
 */
import { readFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { resolve } from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { config, ConfigError, parseConfig, readSetting, resetConfig, settingDocs, settingSchemas } from '@/lib/config';

function problemOf(env: Record<string, string>): ConfigError {
  try {
    parseConfig(env);
  } catch (error) {
    if (error instanceof ConfigError) return error;
    throw error;
  }
  throw new Error(`expected ${JSON.stringify(env)} to be refused`);
}

describe('defaults', () => {
  it('gives every documented default when nothing is set', () => {
    const settings = parseConfig({});
    expect(settings).toMatchObject({
      QUADRILLE_DATA_DIR: resolve('data'),
      QUADRILLE_DEMO: true,
      QUADRILLE_DEMO_CAPTURES: true,
      PORT: 4321,
      HOST: 'localhost',
      QUADRILLE_ALLOWED_HOSTS: [],
      QUADRILLE_STORAGE: 'local',
      QUADRILLE_S3_REGION: 'us-east-1',
      QUADRILLE_S3_FORCE_PATH_STYLE: false,
      QUADRILLE_QUOTA_STORAGE_BYTES: 34_359_738_368, // 32 * 2^30
      QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES: 8_589_934_592, // 8 * 2^30
      QUADRILLE_QUOTA_COMPUTE_SECONDS_PER_DAY: 7200,
      QUADRILLE_QUOTA_CONCURRENT_RUNS: 2,
      QUADRILLE_REQUEST_TIMEOUT_SECONDS: 14_400, // 4 h
      QUADRILLE_UPLOAD_EXPIRY_HOURS: 24,
      QUADRILLE_RUN_MAX_PENDING: 100,
      QUADRILLE_RUN_PROGRESS_MS: 200,
      QUADRILLE_RUN_CANCEL_GRACE_MS: 1500,
      QUADRILLE_RUN_NICE: 19,
      QUADRILLE_SSE_HEARTBEAT_MS: 15_000,
      QUADRILLE_TIMING: false,
      QUADRILLE_DEBUG: false,
    });
    expect(settings.NODE_ENV).toBeUndefined();
    expect(settings.QUADRILLE_RUN_WORKER).toBeUndefined();
    expect(settings.QUADRILLE_RUN_CONCURRENCY).toBe(Math.max(1, availableParallelism() - 1));
  });

  it('treats a blank value as unset and trims the others', () => {
    const settings = parseConfig({ PORT: '  ', QUADRILLE_RUN_NICE: ' 5 ', HOST: ' 0.0.0.0 ', QUADRILLE_ALLOWED_HOSTS: 'a.test, ,b.test' });
    expect(settings.PORT).toBe(4321);
    expect(settings.QUADRILLE_RUN_NICE).toBe(5);
    expect(settings.HOST).toBe('0.0.0.0');
    expect(settings.QUADRILLE_ALLOWED_HOSTS).toEqual(['a.test', 'b.test']);
  });

  it('reads the switches', () => {
    expect(parseConfig({ QUADRILLE_DEMO: '0', QUADRILLE_DEMO_CAPTURES: 'off' })).toMatchObject({ QUADRILLE_DEMO: false, QUADRILLE_DEMO_CAPTURES: false });
    expect(parseConfig({ QUADRILLE_DEMO: 'yes', QUADRILLE_S3_FORCE_PATH_STYLE: 'TRUE' })).toMatchObject({ QUADRILLE_DEMO: true, QUADRILLE_S3_FORCE_PATH_STYLE: true });
    expect(parseConfig({ QUADRILLE_TIMING: 'anything', QUADRILLE_DEBUG: '0' })).toMatchObject({ QUADRILLE_TIMING: true, QUADRILLE_DEBUG: false });
  });
});

describe('byte sizes', () => {
  it.each([
    ['1073741824', 1_073_741_824],
    ['512MiB', 536_870_912], // 512 * 2^20
    ['8GiB', 8_589_934_592], // 8 * 2^30
    ['8 gib', 8_589_934_592],
    ['1.5KiB', 1536],
    ['64MiB', 67_108_864], // 64 * 2^20
    ['2TiB', 2_199_023_255_552], // 2 * 2^40
    ['0', 0],
  ])('reads %s as %d bytes', (text, bytes) => {
    expect(parseConfig({ QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES: text }).QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES).toBe(bytes);
  });

  it.each(['8GB', '-1', 'lots', '1e3', '8 GiBs'])('refuses %j, naming the variable', (text) => {
    const error = problemOf({ QUADRILLE_QUOTA_STORAGE_BYTES: text });
    expect(error.variable).toBe('QUADRILLE_QUOTA_STORAGE_BYTES');
    expect(error.message).toContain(`"${text}"`);
  });
});

describe('bad values', () => {
  it.each([
    ['PORT', 'http', 'a whole number'],
    ['PORT', '70000', 'from 1 to 65535'],
    ['QUADRILLE_RUN_NICE', '20', 'from 0 to 19'],
    ['QUADRILLE_RUN_PROGRESS_MS', '5', '>= 10'],
    ['QUADRILLE_RUN_CONCURRENCY', '0', '>= 1'],
    ['QUADRILLE_QUOTA_CONCURRENT_RUNS', '1.5', 'a whole number'],
    ['QUADRILLE_UPLOAD_EXPIRY_HOURS', '0', 'hours > 0'],
    ['QUADRILLE_REQUEST_TIMEOUT_SECONDS', '-1', 'seconds >= 0'],
    ['QUADRILLE_DEMO', 'maybe', 'true or false'],
    ['QUADRILLE_STORAGE', 'ftp', '"local" or "s3"'],
  ])('%s=%s is refused with its name, the value and the rule', (variable, value, rule) => {
    const error = problemOf({ [variable]: value });
    expect(error.variable).toBe(variable);
    expect(error.message).toContain(variable);
    expect(error.message).toContain(`"${value}"`);
    expect(error.message).toContain(rule);
  });

  it.each([
    [{ QUADRILLE_STORAGE: 's3' }, 'QUADRILLE_S3_BUCKET'],
    [{ QUADRILLE_STORAGE: 's3', QUADRILLE_S3_BUCKET: 'b', QUADRILLE_S3_ENDPOINT: 'localhost:9000' }, 'QUADRILLE_S3_ENDPOINT'],
    [{ QUADRILLE_STORAGE: 's3', QUADRILLE_S3_BUCKET: 'b', QUADRILLE_S3_ACCESS_KEY_ID: 'id' }, 'QUADRILLE_S3_SECRET_ACCESS_KEY'],
    [{ SERVER_CERT_PATH: '/etc/q/cert.pem' }, 'SERVER_KEY_PATH'],
    [{ SERVER_KEY_PATH: '/etc/q/key.pem' }, 'SERVER_CERT_PATH'],
  ])('a rule between variables names the one to fix in %j', (env, variable) => {
    expect(problemOf(env).variable).toBe(variable);
  });

  it('lists every bad variable, not only the first', () => {
    const error = problemOf({ PORT: 'x', QUADRILLE_RUN_NICE: '-1' });
    expect(error.problems.map((p) => p.variable).sort()).toEqual(['PORT', 'QUADRILLE_RUN_NICE']);
  });

  it('reads one variable alone without failing on another', () => {
    expect(readSetting('QUADRILLE_TIMING', { QUADRILLE_TIMING: '1', PORT: 'x' })).toBe(true);
    expect(readSetting('QUADRILLE_TIMING', {})).toBe(false);
    expect(() => readSetting('PORT', { PORT: 'x' })).toThrow(/PORT must be a whole number/);
  });
});

describe('read once', () => {
  afterEach(() => {
    vi.unstubAllEnvs();
    resetConfig();
  });

  it('keeps the first reading until reset', () => {
    vi.stubEnv('QUADRILLE_RUN_NICE', '7');
    resetConfig();
    expect(config().QUADRILLE_RUN_NICE).toBe(7);
    vi.stubEnv('QUADRILLE_RUN_NICE', '3');
    expect(config().QUADRILLE_RUN_NICE).toBe(7);
    resetConfig();
    expect(config().QUADRILLE_RUN_NICE).toBe(3);
  });
});

describe('documentation', () => {
  const names = Object.keys(settingSchemas).sort();

  /** Rows of the README's variable tables: the names in the first column, the default in the second. */
  function readmeRows(): Array<{ names: string[]; default: string }> {
    const readme = readFileSync('README.md', 'utf8');
    return readme.split('\n').flatMap((line) => {
      const cells = line.split('|').slice(1, -1).map((cell) => cell.trim());
      const names = [...(cells[0] ?? '').matchAll(/`([A-Z][A-Z0-9_]+)`/g)].map((m) => m[1]!);
      return names.length ? [{ names, default: (cells[1] ?? '').replace(/`/g, '') }] : [];
    });
  }

  it('the README tables list exactly the variables of the schema', () => {
    expect(readmeRows().flatMap((row) => row.names).sort()).toEqual(names);
  });

  it('the README shows the default the schema documents', () => {
    for (const row of readmeRows()) {
      for (const name of row.names) expect(row.default, name).toBe(settingDocs[name]!.default);
    }
  });

  it('every variable has a description, a unit and a default text', () => {
    expect(Object.keys(settingDocs).sort()).toEqual(names);
    for (const name of names) {
      const schema = settingSchemas[name as keyof typeof settingSchemas];
      expect(schema.description, name).toMatch(/\w{3}/);
      expect(settingDocs[name]!.unit, name).not.toBe('');
    }
  });
});
