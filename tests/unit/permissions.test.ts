import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  access,
  actions,
  can,
  endpointActions,
  pageActions,
  permissionTable,
  roles,
  type Access,
  type Action,
  type Role,
} from '@/lib/permissions';

/**
 * The expected decisions, written out by hand from the role meanings (engineer composes chains;
 * operator uploads captures and reruns team chains but cannot edit chains; admin does everything
 * plus administration; a private item is its owner's only). Columns:
 * signed out | no item | own private item | another user's team item | another user's private item.
 * a = allowed, u = 401, f = 403, h = 404.
 */
const expected: Record<Action, Record<Role, string> & { anonymous: string }> = {
  'session.create': { anonymous: 'a', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'session.delete': { anonymous: 'a', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'setup.create': { anonymous: 'a', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'health.read': { anonymous: 'a', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'account.read': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'account.update': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'capture.read': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'capture.create': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'capture.update': { anonymous: 'u', admin: 'a a a h', engineer: 'a a f h', operator: 'a a f h' },
  'capture.delete': { anonymous: 'u', admin: 'a a a h', engineer: 'a a f h', operator: 'a a f h' },
  'chain.read': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'chain.create': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'f f f h' },
  'chain.update': { anonymous: 'u', admin: 'a a a h', engineer: 'a a f h', operator: 'f f f h' },
  'chain.delete': { anonymous: 'u', admin: 'a a a h', engineer: 'a a f h', operator: 'f f f h' },
  'chain.fork': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'f f f h' },
  'run.create': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'run.read': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'run.export': { anonymous: 'u', admin: 'a a a h', engineer: 'a a a h', operator: 'a a a h' },
  'run.cancel': { anonymous: 'u', admin: 'a a a h', engineer: 'a a f h', operator: 'a a f h' },
  'admin.view': { anonymous: 'u', admin: 'a a a h', engineer: 'f f f h', operator: 'f f f h' },
  'user.list': { anonymous: 'u', admin: 'a a a h', engineer: 'f f f h', operator: 'f f f h' },
  'user.create': { anonymous: 'u', admin: 'a a a h', engineer: 'f f f h', operator: 'f f f h' },
  'user.update': { anonymous: 'u', admin: 'a a a h', engineer: 'f f f h', operator: 'f f f h' },
  'invitation.create': { anonymous: 'u', admin: 'a a a h', engineer: 'f f f h', operator: 'f f f h' },
  'quota.read': { anonymous: 'u', admin: 'a a a h', engineer: 'f f f h', operator: 'f f f h' },
  'quota.update': { anonymous: 'u', admin: 'a a a h', engineer: 'f f f h', operator: 'f f f h' },
  'queue.manage': { anonymous: 'u', admin: 'a a a h', engineer: 'f f f h', operator: 'f f f h' },
  'outbox.read': { anonymous: 'u', admin: 'a a a h', engineer: 'f f f h', operator: 'f f f h' },
};

const outcome: Record<string, Access> = { a: 'allowed', u: 'unauthenticated', f: 'forbidden', h: 'hidden' };
const me = 'user-me';
const someoneElse = 'user-other';
const resources = [
  undefined,
  { ownerId: me, visibility: 'private' as const },
  { ownerId: someoneElse, visibility: 'team' as const },
  { ownerId: someoneElse, visibility: 'private' as const },
];
const columns = ['no item', 'own private item', "another user's team item", "another user's private item"];

describe('permission table', () => {
  it('has an expectation for every action and no expectation for an unknown one', () => {
    expect(Object.keys(expected).sort()).toEqual([...actions].sort());
  });

  const rows = actions.flatMap((action) =>
    roles.flatMap((role) =>
      expected[action][role].split(' ').map((letter, column) => ({ action, role, column, want: outcome[letter]! })),
    ),
  );

  it.each(rows)('$role / $action / column $column', ({ action, role, column, want }) => {
    const user = { id: me, role };
    expect(access(user, action, resources[column]), `${role} ${action} on ${columns[column]}`).toBe(want);
    expect(can(user, action, resources[column])).toBe(want === 'allowed');
  });

  it.each(actions)('signed-out visitor / %s', (action) => {
    expect(access(null, action)).toBe(outcome[expected[action].anonymous]);
  });

  it('owns with the item even when the item is team-visible', () => {
    expect(access({ id: me, role: 'engineer' }, 'chain.update', { ownerId: me, visibility: 'team' })).toBe('allowed');
    expect(access({ id: me, role: 'operator' }, 'chain.update', { ownerId: me, visibility: 'team' })).toBe('forbidden');
  });
});

/** Astro route pattern of a file under src/pages. */
function routeOf(file: string): string {
  const route = '/' + file.replace(/\\/g, '/').replace(/\.(ts|js|astro|md|mdx)$/, '').replace(/(^|\/)index$/, '');
  return route.length > 1 ? route.replace(/\/$/, '') : '/';
}

function filesUnder(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const path = join(folder, name);
    return statSync(path).isDirectory() ? filesUnder(path) : [path];
  });
}

const pagesFolder = 'src/pages';

describe('every endpoint has a permission entry', () => {
  const endpointFiles = filesUnder(join(pagesFolder, 'api')).filter((file) => /\.(ts|js)$/.test(file));
  const table = endpointActions as Record<string, Record<string, Action>>;

  it('finds the endpoint files', () => {
    expect(endpointFiles.length).toBeGreaterThan(0);
  });

  it.each(endpointFiles)('%s', (file) => {
    const route = routeOf(relative(pagesFolder, file));
    expect(table[route], `add '${route}' to endpointActions in src/lib/permissions.ts`).toBeDefined();
    const exported = [...readFileSync(file, 'utf8').matchAll(/export\s+const\s+(GET|POST|PUT|PATCH|DELETE|ALL)\b/g)].map((m) => m[1]);
    expect(exported.length, `${file} exports no handler`).toBeGreaterThan(0);
    expect(exported.sort()).toEqual(Object.keys(table[route]!).sort());
    for (const action of Object.values(table[route]!)) expect(permissionTable).toHaveProperty([action]);
  });

  it('lists no endpoint that does not exist', () => {
    const routes = new Set(endpointFiles.map((file) => routeOf(relative(pagesFolder, file))));
    expect(Object.keys(table).filter((route) => !routes.has(route))).toEqual([]);
  });
});

describe('every page has a permission entry', () => {
  const pageFiles = filesUnder(pagesFolder).filter((file) => file.endsWith('.astro'));

  it.each(pageFiles)('%s', (file) => {
    const route = routeOf(relative(pagesFolder, file));
    const entry = pageActions[route];
    expect(entry, `add '${route}' to pageActions in src/lib/permissions.ts`).toBeDefined();
    expect(entry === 'public' || entry === 'signed-in' || entry! in permissionTable).toBe(true);
  });
});
