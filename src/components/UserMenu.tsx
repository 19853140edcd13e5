import { useEffect, useId, useRef, useState } from 'react';
import { settled } from './query/fetch';
import { useSignOut } from './account-queries';
import { withQueryClient } from './table/withQueryClient';
import { ROLE_LABELS } from './roles';

export interface UserMenuProps {
  name: string;
  email: string;
  role: 'admin' | 'engineer' | 'operator';
}

/** The signed-in user's menu: who is signed in, a link to the account page, and sign-out. */
function UserMenu({ name, email, role }: UserMenuProps) {
  const signOutCall = useSignOut();
  const [open, setOpen] = useState(false);
  const [signingOut, setSigningOut] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const buttonRef = useRef<HTMLButtonElement>(null);
  const panelRef = useRef<HTMLDivElement>(null);
  const panelId = useId();

  useEffect(() => {
    if (!open) return;
    function onPointer(event: PointerEvent) {
      const target = event.target as Node;
      if (!panelRef.current?.contains(target) && !buttonRef.current?.contains(target)) setOpen(false);
    }
    function onKey(event: KeyboardEvent) {
      if (event.key === 'Escape') {
        setOpen(false);
        buttonRef.current?.focus();
      }
    }
    document.addEventListener('pointerdown', onPointer);
    document.addEventListener('keydown', onKey);
    return () => {
      document.removeEventListener('pointerdown', onPointer);
      document.removeEventListener('keydown', onKey);
    };
  }, [open]);

  async function signOut() {
    setSigningOut(true);
    setProblem(null);
    const result = await settled(signOutCall.mutateAsync());
    // 401 means the session had already ended: the sign-in page is the right place either way.
    if (result.ok || result.status === 401) {
      window.location.assign('/sign-in');
      return;
    }
    setSigningOut(false);
    setProblem(result.status === 0 ? 'Sign-out failed: the server did not answer. Try again.' : `Sign-out failed: ${result.error.message}`);
  }

  return (
    <div className="relative">
      <button
        ref={buttonRef}
        type="button"
        aria-expanded={open}
        aria-controls={panelId}
        aria-label={`${name}, ${ROLE_LABELS[role]}: account menu`}
        onClick={() => setOpen((o) => !o)}
        className="flex items-center gap-2 rounded-md py-1 pl-1 pr-2 text-sm hover:bg-surface"
        data-testid="user-menu-button"
      >
        <span aria-hidden="true" className="grid h-7 w-7 place-items-center rounded-full bg-accent/15 text-xs font-semibold text-accent">
          {initials(name)}
        </span>
        <span className="hidden flex-col items-start leading-tight sm:flex">
          <span className="font-medium text-ink">{name}</span>
          <span className="text-xs text-muted">{ROLE_LABELS[role]}</span>
        </span>
        <svg viewBox="0 0 20 20" className={'h-4 w-4 text-muted transition-transform ' + (open ? 'rotate-180' : '')} aria-hidden="true">
          <path d="M5.5 8l4.5 4.5L14.5 8" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
        </svg>
      </button>
      <div
        ref={panelRef}
        id={panelId}
        hidden={!open}
        className="absolute right-0 z-20 mt-1 w-64 rounded-lg border border-line bg-panel py-1 text-sm shadow-lg"
      >
        <div className="border-b border-line px-3 py-2">
          <div className="font-medium">{name}</div>
          <div className="truncate text-muted" title={email}>
            {email}
          </div>
          <div className="mt-1 text-xs text-muted">
            Role: <span className="font-medium text-ink">{ROLE_LABELS[role]}</span>
          </div>
        </div>
        <a href="/account" className="block px-3 py-2 hover:bg-surface">
          Account
        </a>
        <button
          type="button"
          onClick={signOut}
          disabled={signingOut}
          className="block w-full px-3 py-2 text-left hover:bg-surface disabled:text-muted"
        >
          {signingOut ? 'Signing out…' : 'Sign out'}
        </button>
        {problem && (
          <p role="alert" className="px-3 pb-2 text-xs text-danger">
            {problem}
          </p>
        )}
      </div>
    </div>
  );
}

export default withQueryClient(UserMenu, 0);

/** Up to two initials from a display name, for the avatar circle. */
function initials(name: string): string {
  const words = name.trim().split(/\s+/).filter(Boolean);
  const letters = words.length > 1 ? words[0][0] + words[words.length - 1][0] : (words[0] ?? '?').slice(0, 2);
  return letters.toUpperCase();
}
