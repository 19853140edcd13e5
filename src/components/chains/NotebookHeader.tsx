/**
 * The notebook's title bar: chain name (renamed in place by those who may), owner, visibility,
 * which revision is shown and whether there are unsaved edits; Save with an optional message,
 * Fork, Export, and the switch between cells, JSON and both side by side.
 */
import { useState } from 'react';
import { buttonPrimary, buttonSecondary, buttonSmall } from '@/components/ui';
import type { Chain } from '@/contracts/chain';
import { chainExportUrl } from './queries';
import { RunOnCapturesButton } from '@/components/runs/RunOnCapturesDialog';

export type ViewMode = 'cells' | 'json' | 'split';

interface NotebookHeaderProps {
  chain: Chain;
  isOwner: boolean;
  dirty: boolean;
  viewing: number | null;
  mode: ViewMode;
  onMode(mode: ViewMode): void;
  /** Why saving is not possible now, or null when it is. */
  saveBlocked: string | null;
  saving: boolean;
  onSave(message: string): void;
  onRename(name: string): void;
  onVisibility(visibility: 'private' | 'team'): void;
  onFork(): void;
  onRestore(): void;
  onDiscard(): void;
  message?: { tone: 'error' | 'ok'; text: string } | null;
}

export default function NotebookHeader(props: NotebookHeaderProps) {
  const { chain, isOwner, dirty, viewing, mode, onMode, saveBlocked, saving, onSave, onRename, onVisibility, onFork, onRestore, onDiscard, message } = props;
  const [renaming, setRenaming] = useState(false);
  const [name, setName] = useState(chain.name);
  const [saveMessage, setSaveMessage] = useState('');
  const canUpdate = chain.permissions.update;

  return (
    <div className="mb-4 border-b border-line pb-3">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <p className="text-xs text-muted">
            <a href="/chains" className="hover:text-ink hover:underline">
              Chains
            </a>{' '}
            / {chain.owner.name}
            {chain.forkedFrom && (
              <>
                {' '}
                · forked from{' '}
                <a className="underline hover:text-ink" href={`/chains/${chain.forkedFrom.chainId}`}>
                  r{chain.forkedFrom.revision} of another chain
                </a>
              </>
            )}
          </p>
          {renaming ? (
            <form
              className="mt-0.5 flex items-center gap-2"
              onSubmit={(e) => {
                e.preventDefault();
                if (name.trim()) onRename(name.trim());
                setRenaming(false);
              }}
            >
              <input autoFocus className="rounded border border-line bg-surface px-2 py-0.5 text-xl font-semibold" value={name} onChange={(e) => setName(e.target.value)} aria-label="Chain name" maxLength={200} />
              <button className={buttonSmall} type="submit">
                Rename
              </button>
              <button className={buttonSmall} type="button" onClick={() => setRenaming(false)}>
                Cancel
              </button>
            </form>
          ) : (
            <h1 className="mt-0.5 flex items-center gap-2 text-xl font-semibold tracking-tight">
              <span className="truncate">{chain.name}</span>
              {canUpdate && (
                <button type="button" className="text-xs font-normal text-muted hover:text-ink hover:underline" onClick={() => { setName(chain.name); setRenaming(true); }}>
                  rename
                </button>
              )}
            </h1>
          )}
          {chain.description && (
            <p className="mt-0.5 max-w-3xl truncate text-sm text-muted" title={chain.description}>
              {chain.description}
            </p>
          )}
          <div className="mt-1 flex flex-wrap items-center gap-2 text-xs">
            <span className="font-mono">{viewing !== null ? `r${viewing} of ${chain.latestRevision}` : `r${chain.latestRevision}`}</span>
            {viewing !== null ? (
              <span className="rounded bg-amber-500/15 px-1.5 py-px font-medium text-amber-700 dark:text-amber-400">viewing an earlier revision (read-only)</span>
            ) : dirty ? (
              <span className="rounded bg-accent/15 px-1.5 py-px font-medium text-accent" data-testid="dirty">unsaved edits</span>
            ) : (
              <span className="text-muted" data-testid="saved">saved</span>
            )}
            {!canUpdate && viewing === null && <span className="rounded bg-muted/15 px-1.5 py-px text-muted">read-only for you</span>}
            {isOwner ? (
              <label className="flex items-center gap-1 text-muted">
                Visibility
                <select className="rounded border border-line bg-surface px-1 py-0.5 text-xs text-ink" value={chain.visibility} onChange={(e) => onVisibility(e.target.value as 'private' | 'team')} aria-label="Visibility">
                  <option value="private">private (only you)</option>
                  <option value="team">team (everyone signed in)</option>
                </select>
              </label>
            ) : (
              <span className="text-muted">{chain.visibility === 'team' ? 'shared with the team' : 'private'}</span>
            )}
          </div>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <div role="radiogroup" aria-label="View" className="flex overflow-hidden rounded-md border border-line text-xs">
            {(['cells', 'json', 'split'] as ViewMode[]).map((m) => (
              <button
                key={m}
                type="button"
                role="radio"
                aria-checked={mode === m}
                onClick={() => onMode(m)}
                className={'px-2.5 py-1.5 font-medium ' + (mode === m ? 'bg-accent text-panel' : 'bg-panel text-muted hover:text-ink')}
              >
                {m === 'cells' ? 'Cells' : m === 'json' ? 'JSON' : 'Both'}
              </button>
            ))}
          </div>
          {chain.permissions.run && (
            <RunOnCapturesButton chainId={chain.id} chainName={chain.name} revision={viewing ?? chain.latestRevision} unsavedEdits={dirty && viewing === null} className={buttonSecondary + ' py-1.5 text-xs'} />
          )}
          {chain.permissions.fork && (
            <button type="button" className={buttonSecondary + ' py-1.5 text-xs'} onClick={onFork}>
              Fork
            </button>
          )}
          <a className={buttonSecondary + ' py-1.5 text-xs'} href={chainExportUrl(chain.id, viewing ?? undefined)} download>
            Export JSON
          </a>
        </div>
      </div>
      {viewing !== null && canUpdate && (
        <div className="mt-3 flex flex-wrap items-center gap-2 rounded-md border border-amber-500/40 bg-amber-500/10 px-3 py-2 text-sm">
          <span>Revision {viewing} is shown read-only.</span>
          <button type="button" className={buttonSmall} onClick={onRestore}>
            Restore as a new revision
          </button>
          <button type="button" className={buttonSmall} onClick={onDiscard}>
            Back to the latest
          </button>
        </div>
      )}
      {viewing === null && canUpdate && (
        <form
          className="mt-3 flex flex-wrap items-center gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (!saveBlocked) {
              onSave(saveMessage.trim());
              setSaveMessage('');
            }
          }}
        >
          <input
            className="w-full max-w-md flex-1 rounded-md border border-line bg-surface px-2 py-1.5 text-sm"
            placeholder="What changed (optional), e.g. narrower low-pass before decimating"
            value={saveMessage}
            onChange={(e) => setSaveMessage(e.target.value)}
            aria-label="Revision message"
            maxLength={500}
          />
          <button type="submit" className={buttonPrimary + ' py-1.5'} disabled={!!saveBlocked || saving} title={saveBlocked ?? 'Save a new revision (Ctrl+S)'} data-testid="save">
            {saving ? 'Saving…' : 'Save revision'}
          </button>
          {dirty && (
            <button type="button" className={buttonSmall} onClick={onDiscard}>
              Discard edits
            </button>
          )}
          {saveBlocked && dirty && <span className="text-xs text-danger">{saveBlocked}</span>}
          {message && (
            <span role={message.tone === 'error' ? 'alert' : 'status'} className={'text-xs ' + (message.tone === 'error' ? 'text-danger' : 'text-ok')}>
              {message.text}
            </span>
          )}
        </form>
      )}
    </div>
  );
}
