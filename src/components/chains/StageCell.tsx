/**
 * One stage of the notebook: a header with its position, kind and id and the stage's controls
 * (probe, bypass, move, duplicate, remove, and a drag handle that also works from the keyboard),
 * the parameter form, the designed response of a filter or decimation, and what the preview found
 * at it when it is a probe or an analysis stage.
 */
import { memo, useState } from 'react';
import { useSortable } from '@dnd-kit/sortable';
import { CSS } from '@dnd-kit/utilities';
import { getStageDefinition } from '@/dsp/stages/index';
import type { ChainIssue, StreamFormat } from '@/dsp/types';
import StageForm from './StageForm';
import ResponsePlot from './ResponsePlot';
import ProbeView from './ProbeView';
import type { DraftStage } from './draft';
import type { StageResponse } from './use-responses';
import type { PreviewProbe } from './preview-protocol';
import { messageInCell, parameterOf } from './analysis';

export interface StageActions {
  params(id: string, params: Record<string, unknown>): void;
  toggle(id: string, flag: 'probe' | 'bypass'): void;
  move(id: string, delta: number): void;
  duplicate(id: string): void;
  remove(id: string): void;
}

interface StageCellProps {
  stage: DraftStage;
  index: number;
  count: number;
  input?: StreamFormat;
  issues: ChainIssue[];
  response?: StageResponse;
  probe?: PreviewProbe;
  probeStale: boolean;
  previewError?: string;
  readOnly: boolean;
  actions: StageActions;
}

const iconButton =
  'inline-flex h-7 min-w-7 items-center justify-center rounded px-1.5 text-xs font-medium text-muted hover:bg-surface hover:text-ink disabled:cursor-not-allowed disabled:opacity-40';

function StageCell({ stage, index, count, input, issues, response, probe, probeStale, previewError, readOnly, actions }: StageCellProps) {
  const { attributes, listeners, setNodeRef, setActivatorNodeRef, transform, transition, isDragging } = useSortable({ id: stage.id, disabled: readOnly });
  const [collapsed, setCollapsed] = useState(false);
  const definition = getStageDefinition(stage.kind);
  const hasErrors = issues.some((i) => i.severity === 'error');
  const stageLevel = issues.filter((i) => !parameterOf(i));
  const showsResponse = (stage.kind === 'filter' || (stage.kind === 'decimate' && stage.params.antiAlias !== false)) && !stage.bypass;
  const titleId = `stage-${stage.id}-title`;

  return (
    <section
      ref={setNodeRef}
      style={{ transform: CSS.Translate.toString(transform), transition }}
      aria-labelledby={titleId}
      data-stage-id={stage.id}
      data-stage-kind={stage.kind}
      className={
        'relative rounded-lg border bg-panel ' +
        (isDragging ? 'z-10 border-accent shadow-lg ' : hasErrors ? 'border-danger/50 ' : 'border-line ') +
        (stage.bypass ? 'opacity-70' : '')
      }
    >
      <header className="flex flex-wrap items-center gap-x-2 gap-y-1 border-b border-line px-2 py-1.5">
        <button
          type="button"
          ref={setActivatorNodeRef}
          {...attributes}
          {...listeners}
          disabled={readOnly}
          className={iconButton + ' cursor-grab font-mono tracking-tighter active:cursor-grabbing'}
          aria-label={`Drag to reorder ${stage.id}; from the keyboard use Alt+↑ and Alt+↓ in any field of the cell`}
          aria-roledescription="sortable stage"
          title="Drag to reorder (keyboard: Alt+↑ / Alt+↓ in the cell, or the ↑ ↓ buttons)"
        >
          ⠿
        </button>
        <span className="w-6 text-right font-mono text-xs text-muted">{index + 1}</span>
        <h3 id={titleId} className="flex min-w-0 items-baseline gap-2">
          <span className="truncate text-sm font-semibold">{definition?.title ?? stage.kind}</span>
          <span className="font-mono text-xs text-muted">{stage.id}</span>
        </h3>
        {stage.probe && <Badge tone="accent">probe</Badge>}
        {stage.bypass && <Badge tone="muted">bypassed</Badge>}
        {hasErrors && <Badge tone="danger">{issues.filter((i) => i.severity === 'error').length} error{issues.filter((i) => i.severity === 'error').length > 1 ? 's' : ''}</Badge>}
        <div className="ml-auto flex items-center gap-0.5" role="toolbar" aria-label={`Stage ${stage.id}`}>
          <label className={iconButton + ' cursor-pointer gap-1'} title="Keep and plot this stage's output (probe)">
            <input type="checkbox" className="h-3.5 w-3.5 accent-[rgb(var(--q-accent))]" checked={stage.probe} disabled={readOnly} onChange={() => actions.toggle(stage.id, 'probe')} />
            Probe
          </label>
          <label className={iconButton + ' cursor-pointer gap-1'} title="Pass the input through unchanged">
            <input type="checkbox" className="h-3.5 w-3.5 accent-[rgb(var(--q-accent))]" checked={stage.bypass} disabled={readOnly} onChange={() => actions.toggle(stage.id, 'bypass')} />
            Bypass
          </label>
          <span className="mx-1 h-4 border-l border-line" aria-hidden />
          <button type="button" className={iconButton} disabled={readOnly || index === 0} onClick={() => actions.move(stage.id, -1)} aria-label={`Move ${stage.id} up`} title="Move up (Alt+↑)">
            ↑
          </button>
          <button type="button" className={iconButton} disabled={readOnly || index === count - 1} onClick={() => actions.move(stage.id, 1)} aria-label={`Move ${stage.id} down`} title="Move down (Alt+↓)">
            ↓
          </button>
          <button type="button" className={iconButton} disabled={readOnly} onClick={() => actions.duplicate(stage.id)} aria-label={`Duplicate ${stage.id}`} title="Duplicate">
            Duplicate
          </button>
          <button type="button" className={iconButton + ' hover:text-danger'} disabled={readOnly} onClick={() => actions.remove(stage.id)} aria-label={`Remove ${stage.id}`} title="Remove">
            Remove
          </button>
          <button type="button" className={iconButton} onClick={() => setCollapsed((c) => !c)} aria-expanded={!collapsed} aria-label={collapsed ? `Show ${stage.id}` : `Fold ${stage.id}`} title={collapsed ? 'Show' : 'Fold'}>
            {collapsed ? '▸' : '▾'}
          </button>
        </div>
      </header>
      {!collapsed && (
        <div className="@container space-y-3 p-3">
          {stageLevel.length > 0 && (
            <ul className="space-y-0.5">
              {stageLevel.map((issue, n) => (
                <li key={n} className={'text-xs ' + (issue.severity === 'error' ? 'text-danger' : 'text-amber-700 dark:text-amber-400')}>
                  {messageInCell(issue)}
                </li>
              ))}
            </ul>
          )}
          {definition ? (
            <div className={showsResponse ? 'grid gap-4 @5xl:grid-cols-[minmax(0,1fr)_minmax(0,1.2fr)]' : ''}>
              <StageForm stageId={stage.id} definition={definition} params={stage.params} input={input} issues={issues} readOnly={readOnly} onChange={(p) => actions.params(stage.id, p)} />
              {showsResponse &&
                (hasErrors ? (
                  <p className="grid min-h-24 place-items-center rounded-md border border-dashed border-line px-3 text-center text-xs text-muted">
                    The designed response shows once this stage has no errors.
                  </p>
                ) : (
                  <ResponsePlot stageId={stage.id} response={response} />
                ))}
            </div>
          ) : (
            <p className="text-sm text-danger">Unknown stage kind “{stage.kind}”: fix it in the JSON view.</p>
          )}
          {probe && <ProbeView probe={probe} stale={probeStale} />}
          {previewError && <p className="rounded border border-danger/40 bg-danger/5 px-2 py-1 text-xs text-danger">Preview stopped here: {previewError}</p>}
        </div>
      )}
    </section>
  );
}

function Badge({ tone, children }: { tone: 'accent' | 'muted' | 'danger'; children: React.ReactNode }) {
  const colours = { accent: 'bg-accent/15 text-accent', muted: 'bg-muted/15 text-muted', danger: 'bg-danger/15 text-danger' };
  return <span className={`rounded px-1.5 py-px text-[11px] font-medium ${colours[tone]}`}>{children}</span>;
}

export default memo(StageCell);
