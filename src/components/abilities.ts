/**
 * What each section lets people do, as rows for the permission summaries. Each row names an action
 * of the permission table and whose item it concerns, so the pages state exactly what the server
 * enforces.
 */
import { can, type Action, type Actor } from '@/lib/permissions';

/** Whose item a row is about: none, the user's own, or another user's item shared with the team. */
export type Scope = 'none' | 'own' | 'others';

export interface AbilityRow {
  label: string;
  action: Action;
  scope: Scope;
}

export const captureAbilities: AbilityRow[] = [
  { label: 'Read captures shared with the team', action: 'capture.read', scope: 'others' },
  { label: 'Upload or synthesize captures', action: 'capture.create', scope: 'none' },
  { label: 'Edit or delete your own captures', action: 'capture.update', scope: 'own' },
  { label: "Edit or delete other people's team captures", action: 'capture.update', scope: 'others' },
];

export const chainAbilities: AbilityRow[] = [
  { label: 'Read chains shared with the team', action: 'chain.read', scope: 'others' },
  { label: 'Compose new chains', action: 'chain.create', scope: 'none' },
  { label: 'Revise your own chains', action: 'chain.update', scope: 'own' },
  { label: "Revise other people's team chains", action: 'chain.update', scope: 'others' },
  { label: 'Fork a team chain into your own', action: 'chain.fork', scope: 'others' },
];

export const runAbilities: AbilityRow[] = [
  { label: 'Run a team chain on a capture', action: 'run.create', scope: 'others' },
  { label: 'Read and export results of team runs', action: 'run.read', scope: 'others' },
  { label: 'Cancel your own runs', action: 'run.cancel', scope: 'own' },
  { label: "Cancel other people's runs", action: 'run.cancel', scope: 'others' },
];

export const adminAbilities: AbilityRow[] = [
  { label: 'Create accounts, change roles, disable accounts', action: 'user.update', scope: 'none' },
  { label: 'Set storage and compute quotas', action: 'quota.update', scope: 'none' },
  { label: 'See and cancel any run in the queue', action: 'queue.manage', scope: 'none' },
  { label: 'Read the outbox of e-mails sent', action: 'outbox.read', scope: 'none' },
];

/** Whether `actor` may do what `row` describes; "others" items are team items of someone else. */
export function allows(actor: Actor, row: AbilityRow): boolean {
  if (row.scope === 'none') return can(actor, row.action);
  const ownerId = row.scope === 'own' ? actor.id : actor.id + '-someone-else';
  return can(actor, row.action, { ownerId, visibility: 'team' });
}
