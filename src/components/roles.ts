/** Human names and one-line meanings of the roles, shared by pages and islands. */
export const ROLE_LABELS: Record<'admin' | 'engineer' | 'operator', string> = {
  admin: 'Admin',
  engineer: 'Engineer',
  operator: 'Operator',
};

/** What each role is for, in the product's words. */
export const ROLE_SUMMARIES: Record<'admin' | 'engineer' | 'operator', string> = {
  engineer: 'Uploads or synthesizes captures, composes and revises chains, runs them and shares them.',
  operator: 'Uploads captures, reruns chains shared with the team, reads and exports results; cannot edit chains.',
  admin: 'Everything an engineer does, plus accounts, roles and quotas, the run queue and the outbox.',
};
