import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { openDb } from '@/lib/server/db';
import { bundledMigrations, migrateToLatest } from '@/lib/server/db/migration-source';

const folders: string[] = [];

function tempDataDir(): string {
  const folder = mkdtempSync(join(tmpdir(), 'quadrille-migrate-'));
  folders.push(folder);
  return folder;
}

afterEach(() => {
  for (const folder of folders.splice(0)) rmSync(folder, { recursive: true, force: true });
});

/** Runs `npm run migrate`'s command line on a data folder. */
function cliMigrate(dataDir: string): string {
  return execFileSync(process.execPath, ['--import', 'tsx', 'node_modules/knex/bin/cli.js', '--knexfile', 'knexfile.ts', 'migrate:latest'], {
    env: { ...process.env, QUADRILLE_DATA_DIR: dataDir },
    encoding: 'utf8',
  });
}

describe('migrations', () => {
  it('bundles every file in migrations/ under its file name, in order', () => {
    const files = readdirSync('migrations').filter((name) => name.endsWith('.ts')).sort();
    expect(bundledMigrations.map(([name]) => name)).toEqual(files);
    for (const name of files) expect(name).toMatch(/^\d{14}_[a-z]+(_[a-z0-9]+)+\.ts$/);
  });

  it('shares one history between the knex CLI and the server', async () => {
    const dataDir = tempDataDir();
    expect(cliMigrate(dataDir)).toMatch(/Batch 1 run/);
    const db = openDb(dataDir);
    try {
      expect(await migrateToLatest(db)).toEqual([]);
      const pragmas = await db.raw('PRAGMA foreign_keys');
      expect(pragmas[0].foreign_keys).toBe(1);
      expect((await db.raw('PRAGMA journal_mode'))[0].journal_mode).toBe('wal');
    } finally {
      await db.destroy();
    }
  });

  it('lets the CLI find nothing to do after the server migrated', async () => {
    const dataDir = tempDataDir();
    const db = openDb(dataDir);
    try {
      expect((await migrateToLatest(db)).length).toBe(bundledMigrations.length);
    } finally {
      await db.destroy();
    }
    expect(cliMigrate(dataDir)).toMatch(/Already up to date/);
  });

  it('rolls every migration back cleanly', async () => {
    const db = openDb(tempDataDir());
    try {
      await migrateToLatest(db);
      const { bundledMigrationSource } = await import('@/lib/server/db/migration-source');
      await db.migrate.rollback({ migrationSource: bundledMigrationSource }, true);
      expect(await db.schema.hasTable('users')).toBe(false);
    } finally {
      await db.destroy();
    }
  });
});
