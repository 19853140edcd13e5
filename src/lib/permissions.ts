/**
 * Who may do what: one declarative table of role x action x ownership, consulted by every endpoint
 * and page. Pure data and functions, so pages and islands import it as freely as the server.
 *
 * Grants:
 * - `any`: the role may do it, to any item (or the action concerns no item).
 * - `visible`: to items it can see: its own, and other users' `team` items.
 * - `own`: only to its own items.
 * A private item of another user is hidden: the API answers 404 for it, never 403, so nothing
 * reveals that it exists. Admins do not see other users' private items either: `private` means
 * owner only.
 */

export const roles = ['admin', 'engineer', 'operator'] as const;
/** An account's role; meanings in the product brief (engineer composes chains, operator reruns them). */
export type Role = (typeof roles)[number];

export type Grant = 'any' | 'visible' | 'own';

/** Who an action is open to before roles count: everyone, or signed-in users only. */
export type Audience = 'public' | 'signed-in';

interface ActionRule {
  audience: Audience;
  grants: Partial<Record<Role, Grant>>;
}

const everyone: ActionRule['grants'] = { admin: 'any', engineer: 'any', operator: 'any' };
const adminOnly: ActionRule['grants'] = { admin: 'any' };

/** The permission table. Absent role = not allowed. */
export const permissionTable = {
  // Sessions and the first account: open before sign-in.
  'session.create': { audience: 'public', grants: everyone },
  'session.delete': { audience: 'public', grants: everyone },
  'setup.create': { audience: 'public', grants: everyone },
  'health.read': { audience: 'public', grants: everyone },
  // One's own account.
  'account.read': { audience: 'signed-in', grants: everyone },
  'account.update': { audience: 'signed-in', grants: everyone },
  // Captures: everyone uploads; owners edit their own, admins also team captures.
  'capture.read': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'visible', operator: 'visible' } },
  'capture.create': { audience: 'signed-in', grants: everyone },
  'capture.update': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'own', operator: 'own' } },
  'capture.delete': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'own', operator: 'own' } },
  // Chains: operators read and rerun them but never edit.
  'chain.read': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'visible', operator: 'visible' } },
  'chain.create': { audience: 'signed-in', grants: { admin: 'any', engineer: 'any' } },
  'chain.update': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'own' } },
  'chain.delete': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'own' } },
  'chain.fork': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'visible' } },
  // Runs: the resource of run.create is the chain being run.
  'run.create': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'visible', operator: 'visible' } },
  'run.read': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'visible', operator: 'visible' } },
  'run.export': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'visible', operator: 'visible' } },
  'run.cancel': { audience: 'signed-in', grants: { admin: 'visible', engineer: 'own', operator: 'own' } },
  // Administration.
  'admin.view': { audience: 'signed-in', grants: adminOnly },
  'user.list': { audience: 'signed-in', grants: adminOnly },
  'user.create': { audience: 'signed-in', grants: adminOnly },
  'user.update': { audience: 'signed-in', grants: adminOnly },
  'invitation.create': { audience: 'signed-in', grants: adminOnly },
  'quota.read': { audience: 'signed-in', grants: adminOnly },
  'quota.update': { audience: 'signed-in', grants: adminOnly },
  'queue.manage': { audience: 'signed-in', grants: adminOnly },
  'outbox.read': { audience: 'signed-in', grants: adminOnly },
} as const satisfies Record<string, ActionRule>;

export type Action = keyof typeof permissionTable;

export const actions = Object.keys(permissionTable) as Action[];

/** The acting user as far as permissions care. */
export interface Actor {
  id: string;
  role: Role;
}

/** The ownership facts of an item an action targets. */
export interface OwnedResource {
  ownerId: string;
  visibility: 'private' | 'team';
}

/**
 * Outcome of an access check, which the API turns into a status:
 * allowed, unauthenticated (401), forbidden (403) or hidden (404: a private item of someone else).
 */
export type Access = 'allowed' | 'unauthenticated' | 'forbidden' | 'hidden';

function grantOf(action: Action, role: Role): Grant | undefined {
  const grants: Partial<Record<Role, Grant>> = permissionTable[action].grants;
  return grants[role];
}

/** Decides `action` for `user` on `resource` (omit the resource for actions on no item). */
export function access(user: Actor | null, action: Action, resource?: OwnedResource): Access {
  const rule = permissionTable[action];
  if (!user) return rule.audience === 'public' ? 'allowed' : 'unauthenticated';
  const grant = grantOf(action, user.role);
  if (!resource) return grant ? 'allowed' : 'forbidden';
  const own = resource.ownerId === user.id;
  if (!own && resource.visibility === 'private') return 'hidden';
  if (!grant) return 'forbidden';
  if (grant === 'own' && !own) return 'forbidden';
  return 'allowed';
}

/**
 * True when `user` may do `action` (to `resource` if given). Without a resource it answers whether
 * the role may do it at all, e.g. to decide whether to show an "Edit" control.
 */
export function can(user: Actor | null, action: Action, resource?: OwnedResource): boolean {
  return access(user, action, resource) === 'allowed';
}

/** `ALL` is an endpoint that takes every method itself (the tus upload protocol uses HEAD and PATCH). */
export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE' | 'ALL';

/**
 * Every API endpoint, by Astro route pattern and method, with the action it performs. The
 * middleware answers 401 for a signed-in action without a session and 405 for an unlisted method;
 * a test fails when a file under src/pages/api has no entry here.
 */
export const endpointActions = {
  '/api/health': { GET: 'health.read' },
  '/api/setup': { POST: 'setup.create' },
  '/api/auth/sign-in': { POST: 'session.create' },
  '/api/auth/sign-out': { POST: 'session.delete' },
  '/api/me': { GET: 'account.read' },
  '/api/account/password': { POST: 'account.update' },
  '/api/admin/users': { GET: 'user.list', POST: 'user.create' },
  '/api/admin/users/[id]': { PATCH: 'user.update' },
  '/api/chains': { GET: 'chain.read', POST: 'chain.create' },
  '/api/chains/[id]': { GET: 'chain.read', PATCH: 'chain.update', DELETE: 'chain.delete' },
  '/api/chains/[id]/revisions': { GET: 'chain.read', POST: 'chain.update' },
  '/api/chains/[id]/revisions/[revision]': { GET: 'chain.read' },
  '/api/chains/[id]/diff': { GET: 'chain.read' },
  '/api/chains/[id]/restore': { POST: 'chain.update' },
  '/api/chains/[id]/fork': { POST: 'chain.fork' },
  '/api/chains/[id]/export': { GET: 'chain.read' },
  // Runs: retry makes a new run, so it is run.create (the endpoint also requires owning the run).
  '/api/runs': { GET: 'run.read', POST: 'run.create' },
  '/api/runs/compare': { GET: 'run.read' },
  '/api/runs/[id]': { GET: 'run.read' },
  '/api/runs/[id]/cancel': { POST: 'run.cancel' },
  '/api/runs/[id]/retry': { POST: 'run.create' },
  '/api/runs/[id]/events': { GET: 'run.read' },
  '/api/runs/[id]/export': { GET: 'run.export' },
  '/api/runs/[id]/plot': { GET: 'run.read' },
  // Captures: uploads (one request, or resumable through tus under /api/uploads) and synthesis create.
  '/api/captures': { GET: 'capture.read', POST: 'capture.create' },
  '/api/captures/check': { POST: 'capture.create' },
  '/api/captures/bulk-delete': { POST: 'capture.delete' },
  '/api/captures/[id]': { GET: 'capture.read', PATCH: 'capture.update', DELETE: 'capture.delete' },
  '/api/captures/[id]/data': { GET: 'capture.read' },
  '/api/captures/[id]/export': { GET: 'capture.read' },
  '/api/uploads': { POST: 'capture.create' },
  '/api/uploads/[id]': { ALL: 'capture.create' },
  '/api/uploads/[id]/capture': { GET: 'capture.create' },
  '/api/synth': { POST: 'capture.create' },
} as const satisfies Record<string, Partial<Record<HttpMethod, Action>>>;

/**
 * Pages and the action a visitor needs to see them; `signed-in` pages need only a session and
 * `public` pages need nothing. Pages of later issues are listed with the action they will check.
 */
export const pageActions: Record<string, Action | Audience> = {
  '/sign-in': 'public',
  '/403': 'public',
  '/404': 'public',
  '/': 'signed-in',
  '/account': 'account.update',
  '/captures': 'capture.read',
  '/captures/[id]': 'capture.read',
  '/captures/synthesize': 'capture.create',
  '/chains': 'chain.read',
  '/chains/new': 'chain.create',
  '/chains/[id]': 'chain.read',
  '/runs': 'run.read',
  '/runs/[id]': 'run.read',
  '/runs/compare': 'run.read',
  '/admin': 'admin.view',
};

/**
 * The action of an API request, or undefined when the route or method is not in the table. HEAD
 * counts as GET (as Astro serves it); an `ALL` entry covers every method its endpoint accepts.
 */
export function endpointAction(routePattern: string, method: string): Action | undefined {
  const methods: Partial<Record<string, Action>> | undefined = (
    endpointActions as Record<string, Partial<Record<string, Action>>>
  )[routePattern];
  const upper = method.toUpperCase();
  return methods?.[upper] ?? (upper === 'HEAD' ? methods?.GET : undefined) ?? methods?.ALL;
}
