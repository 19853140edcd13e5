/**
 * "One declaration per shape", checked: every type name src/contracts exports is declared once in
 * src/ and workers/ (in src/contracts, or in src/dsp for the engine's own shapes that the contracts
 * re-export). A second `interface X` or `type X =` anywhere else fails here, naming its file.
 * Plain re-exports (`export type { X } from ...`) and imports are not declarations.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(__dirname, '..', '..');
const contractsDir = join(root, 'src', 'contracts');

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) return sourceFiles(path);
    return /\.(ts|tsx|mts)$/.test(entry.name) && !entry.name.endsWith('.d.ts') ? [path] : [];
  });
}

/** Source text without comments, so prose such as "the interface Capture" is not read as code. */
function code(text: string): string {
  return text.replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"`])\/\/.*$/gm, '$1');
}

/** Names a module exports: declarations and the names of `export { a, b as c }` lists. */
function exportedNames(text: string): string[] {
  const source = code(text);
  const names = [...source.matchAll(/\bexport\s+(?:declare\s+)?(?:const|let|function|class|interface|type|enum)\s+(\w+)/g)].map((m) => m[1]!);
  for (const list of source.matchAll(/\bexport\s+(?:type\s+)?\{([^}]*)\}/g)) {
    for (const item of list[1]!.split(',')) {
      const name = item.trim().replace(/^type\s+/, '').split(/\s+as\s+/).pop()!.trim();
      if (name) names.push(name);
    }
  }
  return names;
}

/** Type names a module declares (`interface X`, `type X =`, exported or not); imports and re-exports do not count. */
function declaredTypeNames(text: string): string[] {
  const source = code(text);
  const interfaces = [...source.matchAll(/(?:^|[\s;{}(])interface\s+(\w+)\b/g)].map((m) => m[1]!);
  const aliases = [...source.matchAll(/(?:^|[\s;{}(])type\s+(\w+)\b[^=;{}()\n]*=/g)].map((m) => m[1]!);
  return [...interfaces, ...aliases];
}

const contractNames = new Set(sourceFiles(contractsDir).flatMap((file) => exportedNames(readFileSync(file, 'utf8'))));

/** Every declaration of a contract type name in src/ and workers/: name -> files (repeated when a file declares it twice). */
function declarations(): Map<string, string[]> {
  const found = new Map<string, string[]>();
  for (const file of [...sourceFiles(join(root, 'src')), ...sourceFiles(join(root, 'workers'))]) {
    for (const name of declaredTypeNames(readFileSync(file, 'utf8'))) {
      if (!contractNames.has(name)) continue;
      found.set(name, [...(found.get(name) ?? []), relative(root, file)]);
    }
  }
  return found;
}

describe('one declaration per shape', () => {
  it('reads declarations and not imports or re-exports (the checker itself)', () => {
    const sample = [
      "import type { Capture } from '@/contracts/capture';",
      "import { type RunSummary, other } from '@/contracts';",
      "export type { ChainDocument } from '@/contracts/chain';",
      '/** Unlike the interface Prose in this comment. */',
      'export interface Capture { id: string }',
      'type RunSummary<T = number> = { value: T };',
      'export type ChainList = z.infer<typeof chainListSchema>;',
    ].join('\n');
    expect(declaredTypeNames(sample).sort()).toEqual(['Capture', 'ChainList', 'RunSummary']);
    expect(exportedNames("export { a, b as c } from './x';\nexport type { D } from './y';\nexport const e = 1;").sort()).toEqual(['D', 'a', 'c', 'e']);
  });

  it('knows the contract shapes', () => {
    for (const name of ['Capture', 'CaptureChanges', 'ChainDocument', 'StoredChainDocument', 'RunSummary', 'RunResults', 'PresentedRun', 'PresentedRunError', 'ApiErrorInfo']) {
      expect(contractNames, name).toContain(name);
    }
  });

  it('declares each contract type once, in src/contracts or (for the engine\'s own) in src/dsp', () => {
    const copies: string[] = [];
    for (const [name, files] of declarations()) {
      const home = files.filter((file) => file.startsWith('src/contracts/') || file.startsWith('src/dsp/'));
      const elsewhere = files.filter((file) => !home.includes(file));
      if (elsewhere.length > 0 || home.length > 1) copies.push(`${name}: ${files.join(', ')}`);
    }
    expect(copies).toEqual([]);
  });
});
