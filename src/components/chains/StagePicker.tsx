/**
 * Adds a stage: a list of the stage kinds with their one-line summaries, filtered as one types,
 * chosen with the arrow keys and Enter or with the mouse. Kinds that cannot take the stream at
 * this point (a real-only stage after a complex one) are marked, not hidden.
 */
import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { listStageKinds, getStageDefinition } from '@/dsp/stages/index';
import type { SampleType } from '@/dsp/types';
import { buttonSmall } from '@/components/ui';

interface StagePickerProps {
  /** Sample type fed to the new stage, to mark kinds that do not accept it. */
  inputType?: SampleType;
  onPick(kind: string): void;
  label?: string;
  /** Start open (the empty notebook). */
  initiallyOpen?: boolean;
}

export default function StagePicker({ inputType, onPick, label = 'Add stage', initiallyOpen = false }: StagePickerProps) {
  const [open, setOpen] = useState(initiallyOpen);
  const [query, setQuery] = useState('');
  const [active, setActive] = useState(0);
  const searchRef = useRef<HTMLInputElement>(null);
  const listId = useId();
  const kinds = useMemo(() => {
    const q = query.trim().toLowerCase();
    return listStageKinds().filter((k) => !q || k.kind.includes(q) || k.title.toLowerCase().includes(q) || k.summary.toLowerCase().includes(q));
  }, [query]);

  useEffect(() => {
    if (open && !initiallyOpen) searchRef.current?.focus();
  }, [open, initiallyOpen]);
  // An emptied notebook offers the kinds again.
  useEffect(() => {
    if (initiallyOpen) setOpen(true);
  }, [initiallyOpen]);
  useEffect(() => setActive(0), [query]);

  const pick = (kind: string) => {
    onPick(kind);
    setQuery('');
    setOpen(false);
  };

  if (!open) {
    return (
      <button type="button" className={buttonSmall + ' gap-1'} onClick={() => setOpen(true)} data-testid="add-stage">
        <span aria-hidden>+</span> {label}
      </button>
    );
  }
  return (
    <div className="rounded-md border border-line bg-panel p-2 shadow-sm" data-testid="stage-picker">
      <div className="flex items-center gap-2">
        <input
          ref={searchRef}
          type="search"
          value={query}
          onChange={(e) => setQuery(e.target.value)}
          onKeyDown={(e) => {
            if (e.key === 'ArrowDown') {
              e.preventDefault();
              setActive((a) => Math.min(kinds.length - 1, a + 1));
            } else if (e.key === 'ArrowUp') {
              e.preventDefault();
              setActive((a) => Math.max(0, a - 1));
            } else if (e.key === 'Enter' && kinds[active]) {
              e.preventDefault();
              pick(kinds[active].kind);
            } else if (e.key === 'Escape' && !initiallyOpen) {
              setOpen(false);
            }
          }}
          placeholder="Find a stage kind (filter, decimate, spectrum…)"
          aria-label="Find a stage kind"
          aria-controls={listId}
          aria-activedescendant={kinds[active] ? `${listId}-${kinds[active].kind}` : undefined}
          className="block w-full rounded border border-line bg-surface px-2 py-1 text-sm"
        />
        {!initiallyOpen && (
          <button type="button" className={buttonSmall} onClick={() => setOpen(false)}>
            Close
          </button>
        )}
      </div>
      <ul id={listId} role="listbox" aria-label="Stage kinds" className="mt-2 grid gap-1 sm:grid-cols-2">
        {kinds.map((k, n) => {
          const accepts = inputType ? getStageDefinition(k.kind)?.accepts.includes(inputType) : true;
          return (
            <li
              key={k.kind}
              id={`${listId}-${k.kind}`}
              role="option"
              aria-selected={n === active}
              onMouseEnter={() => setActive(n)}
              onClick={() => pick(k.kind)}
              data-kind={k.kind}
              className={'cursor-pointer rounded px-2 py-1.5 ' + (n === active ? 'bg-accent/10 ring-1 ring-accent/40' : 'hover:bg-surface')}
            >
              <span className="flex items-baseline justify-between gap-2">
                <span className="text-sm font-medium">{k.title}</span>
                <span className="font-mono text-[11px] text-muted">{k.kind}</span>
              </span>
              <span className="block text-xs leading-4 text-muted">{k.summary}</span>
              {!accepts && inputType && <span className="mt-0.5 block text-[11px] text-amber-700 dark:text-amber-400">does not take {inputType} input here</span>}
            </li>
          );
        })}
        {kinds.length === 0 && <li className="px-2 py-1 text-sm text-muted">No stage kind matches “{query}”.</li>}
      </ul>
    </div>
  );
}
