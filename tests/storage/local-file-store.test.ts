import { mkdtemp, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { LocalFileStore } from '@/lib/server/storage';
import { objectStoreContract } from './contract';

/** Every dot-file (temporary write) anywhere under the root. */
async function tempFiles(root: string): Promise<string[]> {
  const entries = await readdir(root, { recursive: true, withFileTypes: true }).catch(() => []);
  return entries
    .filter((entry) => entry.isFile() && entry.name.startsWith('.'))
    .map((entry) => join(entry.parentPath, entry.name));
}

objectStoreContract('LocalFileStore', async () => {
  const folder = await mkdtemp(join(tmpdir(), 'quadrille-objects-'));
  const root = join(folder, 'objects');
  return {
    store: new LocalFileStore(root),
    strays: () => tempFiles(root),
    close: () => rm(folder, { recursive: true, force: true }),
  };
});
