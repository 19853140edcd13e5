/**
 * Knex configuration shared by the knex CLI (knexfile.ts), `npm start` and the built server.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Knex } from 'knex';
import { dataDir } from '../config';

/** Path of the SQLite database file inside a data folder. */
export function databasePath(folder: string = dataDir()): string {
  return join(folder, 'quadrille.sqlite3');
}

interface SqliteConnection {
  pragma(source: string): unknown;
}

/** Knex settings for the SQLite database in `folder`; creates the folder when missing. */
export function knexConfig(folder: string = dataDir()): Knex.Config {
  mkdirSync(folder, { recursive: true });
  return {
    client: 'better-sqlite3',
    connection: { filename: databasePath(folder) },
    useNullAsDefault: true,
    pool: {
      // Every connection needs these: foreign keys are off by default in SQLite, WAL lets readers
      // (tests, the CLI) work while the server writes, and the busy timeout waits out short locks.
      afterCreate(connection: SqliteConnection, done: (error: Error | null, connection: unknown) => void) {
        try {
          connection.pragma('journal_mode = WAL');
          connection.pragma('foreign_keys = ON');
          connection.pragma('busy_timeout = 5000');
          done(null, connection);
        } catch (error) {
          done(error as Error, connection);
        }
      },
    },
  };
}
