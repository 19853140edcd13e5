/**
 * DEVELOPERS.md's "Folders and what may import what" holds: every import, export-from and dynamic
 * import in src/, workers/, bin/ and scripts/ is checked against the rules below, and the table in
 * DEVELOPERS.md must list exactly the folders these rules cover, so the two cannot drift apart.
 */
import { builtinModules } from 'node:module';
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = resolve('.');

/** What one folder may import. Internal targets are repository paths (a trailing `/` is a folder). */
interface Rule {
  /** The folders/files as DEVELOPERS.md's first column writes them. */
  folders: string[];
  /** Source files the rule covers (repository-relative path). */
  covers: (file: string) => boolean;
  /** Internal paths it may import at run time. `*` is anything. */
  internal: string[];
  /** Internal paths it may import types from (besides `internal`). */
  typesFrom?: string[];
  /** npm packages: `*` for any, else the list; Node's built-in modules count as `node`. */
  packages: string[];
  /** Packages it may import types from only. */
  packageTypes?: string[];
}

const ANY = ['*'];
const npmAndNode = ['*'];

// Most specific first: a file takes the first rule that covers it.
const rules: Rule[] = [
  { folders: ['src/dsp/'], covers: (f) => f.startsWith('src/dsp/'), internal: ['src/dsp/'], packages: ['zod', 'fft.js'] },
  { folders: ['src/contracts/'], covers: (f) => f.startsWith('src/contracts/'), internal: ['src/contracts/', 'src/dsp/'], packages: ['zod'] },
  {
    folders: ['src/cli/', 'bin/'],
    covers: (f) => f.startsWith('src/cli/') || f.startsWith('bin/'),
    internal: ['src/cli/', 'src/dsp/', 'src/contracts/', 'src/lib/config/', 'src/lib/units.ts'],
    packages: npmAndNode,
  },
  { folders: ['src/lib/permissions.ts'], covers: (f) => f === 'src/lib/permissions.ts', internal: [], packages: [] },
  { folders: ['src/lib/units.ts'], covers: (f) => f === 'src/lib/units.ts', internal: [], packages: [] },
  { folders: ['src/lib/password-rules.ts'], covers: (f) => f === 'src/lib/password-rules.ts', internal: [], packages: [] },
  { folders: ['src/lib/chain-diff.ts'], covers: (f) => f === 'src/lib/chain-diff.ts', internal: ['src/contracts/'], packages: [] },
  {
    folders: ['src/lib/config/'],
    covers: (f) => f.startsWith('src/lib/config/'),
    internal: ['src/lib/config/', 'src/lib/units.ts'],
    packages: ['zod', 'node'],
  },
  {
    folders: ['src/lib/server/'],
    covers: (f) => f.startsWith('src/lib/server/'),
    internal: ['src/lib/', 'src/dsp/', 'src/contracts/'],
    packages: npmAndNode,
  },
  {
    folders: ['src/middleware.ts'],
    covers: (f) => f === 'src/middleware.ts',
    internal: ['src/lib/server/', 'src/lib/permissions.ts', 'src/contracts/'],
    packages: npmAndNode,
  },
  { folders: ['src/pages/api/'], covers: (f) => f.startsWith('src/pages/api/'), internal: ['src/lib/', 'src/contracts/'], packages: npmAndNode },
  {
    folders: ['src/pages/**/*.astro', 'src/layouts/', 'src/components/**/*.astro'],
    covers: (f) => f.startsWith('src/pages/') || f.startsWith('src/layouts/') || (f.startsWith('src/components/') && f.endsWith('.astro')),
    internal: ['src/lib/', 'src/components/', 'src/layouts/', 'src/styles/', 'src/contracts/', 'src/dsp/'],
    packages: npmAndNode,
  },
  {
    folders: ['src/components/'],
    covers: (f) => f.startsWith('src/components/'),
    internal: ['src/components/', 'src/lib/permissions.ts', 'src/lib/units.ts', 'src/lib/password-rules.ts', 'src/lib/chain-diff.ts', 'src/dsp/', 'src/contracts/'],
    typesFrom: ['src/lib/server/'],
    packages: ['*'],
  },
  {
    folders: ['src/types/', 'src/env.d.ts'],
    covers: (f) => f.startsWith('src/types/') || f === 'src/env.d.ts',
    internal: [],
    typesFrom: ['src/'],
    packages: [],
    packageTypes: ['*'],
  },
  { folders: ['migrations/'], covers: (f) => f.startsWith('migrations/'), internal: [], packages: [], packageTypes: ['knex'] },
  {
    folders: ['workers/'],
    covers: (f) => f.startsWith('workers/'),
    internal: ['workers/', 'src/dsp/', 'src/lib/server/', 'src/contracts/'],
    packages: npmAndNode,
  },
  { folders: ['scripts/'], covers: (f) => f.startsWith('scripts/'), internal: ANY, packages: ANY },
  { folders: ['tests/'], covers: (f) => f.startsWith('tests/'), internal: ANY, packages: ANY },
];

const scanned = ['src', 'workers', 'bin', 'scripts', 'migrations'];
const codeFile = /\.(ts|tsx|astro|mjs)$/;

function listFiles(dir: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir, { withFileTypes: true }).flatMap((item) => {
    const path = join(dir, item.name);
    if (item.isDirectory()) return listFiles(path);
    return codeFile.test(item.name) ? [path] : [];
  });
}

interface ImportUse {
  specifier: string;
  typeOnly: boolean;
}

// `import x from 'y'`, `import type x from 'y'`, `export { x } from 'y'`, `import 'y'`, `import('y')`.
const STATIC = /(?:^|[;\s])(import|export)\s+(type\s+)?([^'";]*?)\s*from\s*['"]([^'"]+)['"]/g;
const BARE = /(?:^|[;\s])import\s*['"]([^'"]+)['"]/g;
const DYNAMIC = /\bimport\(\s*['"]([^'"]+)['"]\s*\)/g;

/** Comments hold example imports in prose; drop them before scanning. */
function withoutComments(source: string): string {
  return source.replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"`])\/\/.*$/gm, '$1');
}

function importsOf(source: string): ImportUse[] {
  const text = withoutComments(source);
  const uses: ImportUse[] = [];
  for (const m of text.matchAll(STATIC)) {
    const clause = m[3] ?? '';
    const names = /^\{([^}]*)\}$/.exec(clause.trim())?.[1]?.split(',').map((s) => s.trim()).filter(Boolean);
    const allTypes = names !== undefined && names.length > 0 && names.every((n) => n.startsWith('type '));
    uses.push({ specifier: m[4]!, typeOnly: Boolean(m[2]) || allTypes });
  }
  for (const m of text.matchAll(BARE)) uses.push({ specifier: m[1]!, typeOnly: false });
  // `import('x').Type` in a type position is a type-only use.
  for (const m of text.matchAll(DYNAMIC)) uses.push({ specifier: m[1]!, typeOnly: text[m.index! + m[0].length] === '.' });
  return uses;
}

const builtins = new Set(builtinModules);

type Target = { kind: 'internal'; path: string } | { kind: 'package'; name: string };

function resolveSpecifier(file: string, specifier: string): Target {
  const bare = specifier.split('?')[0]!;
  if (bare.startsWith('@/') || bare.startsWith('.')) {
    const absolute = bare.startsWith('@/') ? join(root, 'src', bare.slice(2)) : resolve(dirname(join(root, file)), bare);
    const candidates = ['', '.ts', '.tsx', '.mjs', '.js', '.astro', '/index.ts', '/index.tsx'].map((ext) => absolute + ext);
    const found = candidates.find((c) => existsSync(c) && statSync(c).isFile()) ?? absolute;
    return { kind: 'internal', path: relative(root, found).split('\\').join('/') };
  }
  if (bare.startsWith('node:') || builtins.has(bare.split('/')[0]!)) return { kind: 'package', name: 'node' };
  const parts = bare.split('/');
  return { kind: 'package', name: bare.startsWith('@') ? parts.slice(0, 2).join('/') : parts[0]! };
}

function within(path: string, allowed: string[]): boolean {
  return allowed.some((a) => a === '*' || (a.endsWith('/') ? path.startsWith(a) : path === a));
}

/** Every import that breaks its file's rule, as "file: 'specifier' (rule)". */
function violations(): string[] {
  const found: string[] = [];
  for (const file of scanned.flatMap((dir) => listFiles(join(root, dir))).map((f) => relative(root, f))) {
    const rule = rules.find((r) => r.covers(file));
    if (!rule) {
      found.push(`${file}: not covered by any row of the import table`);
      continue;
    }
    // A declaration file holds no code that runs: everything it imports is a type.
    const declarations = file.endsWith('.d.ts');
    for (const scanned of importsOf(readFileSync(join(root, file), 'utf8'))) {
      const use = declarations ? { ...scanned, typeOnly: true } : scanned;
      const target = resolveSpecifier(file, use.specifier);
      let allowed: boolean;
      if (target.kind === 'internal') {
        allowed = within(target.path, rule.internal) || (use.typeOnly && within(target.path, rule.typesFrom ?? []));
      } else {
        allowed = rule.packages.includes('*') && target.name !== 'node'
          ? true
          : rule.packages.includes(target.name) || (use.typeOnly && (rule.packageTypes ?? []).some((p) => p === '*' || p === target.name));
        // `*` means npm packages and Node: every area listed with `*` runs on Node, except the islands.
        if (target.name === 'node' && rule.packages.includes('*')) allowed = !rule.folders.includes('src/components/');
      }
      if (!allowed) {
        const where = target.kind === 'internal' ? target.path : `package ${target.name}`;
        found.push(`${file}: '${use.specifier}' -> ${where}${use.typeOnly ? ' (types)' : ''} breaks the rule of ${rule.folders.join(', ')}`);
      }
    }
  }
  return found;
}

/** Backticked paths in the first column of DEVELOPERS.md's import table. */
function documentedFolders(): string[] {
  const doc = readFileSync(join(root, 'DEVELOPERS.md'), 'utf8');
  const section = doc.split('### Folders and what may import what')[1]?.split('\n### ')[0] ?? '';
  const folders: string[] = [];
  for (const line of section.split('\n')) {
    if (!line.startsWith('|') || line.startsWith('|---') || line.startsWith('| folder')) continue;
    const first = line.split('|')[1] ?? '';
    for (const m of first.matchAll(/`([^`]+)`/g)) folders.push(m[1]!);
  }
  return folders.sort();
}

describe('import rules (DEVELOPERS.md)', () => {
  it('the table in DEVELOPERS.md lists exactly the folders these rules check', () => {
    expect(documentedFolders()).toEqual(rules.flatMap((r) => r.folders).sort());
  });

  it('the scanner sees each kind of import', () => {
    const uses = importsOf(
      [
        "import a from '@/dsp/a';",
        "import type { B } from '../b';",
        "import { type C, type D } from './c';",
        "export { e } from 'zod';",
        "import './side-effect.css';",
        "const f = await import('node:fs');",
        "let g: import('./g').G;",
        "// import h from 'in-a-comment';",
      ].join('\n'),
    );
    expect(uses).toEqual([
      { specifier: '@/dsp/a', typeOnly: false },
      { specifier: '../b', typeOnly: true },
      { specifier: './c', typeOnly: true },
      { specifier: 'zod', typeOnly: false },
      { specifier: './side-effect.css', typeOnly: false },
      { specifier: 'node:fs', typeOnly: false },
      { specifier: './g', typeOnly: true },
    ]);
  });

  it('every import in src/, workers/, bin/, scripts/ and migrations/ follows its folder rule', () => {
    expect(violations()).toEqual([]);
  });
});
