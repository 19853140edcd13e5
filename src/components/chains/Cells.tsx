/**
 * The vertical list of stage cells with the format strip after each one, reorderable by drag
 * (pointer) and by keyboard: the drag handle takes space + arrows, and Alt+↑ / Alt+↓ move the cell
 * that holds the focus.
 */
import { DndContext, KeyboardSensor, PointerSensor, closestCorners, useSensor, useSensors, type DragEndEvent } from '@dnd-kit/core';
import { SortableContext, sortableKeyboardCoordinates, verticalListSortingStrategy } from '@dnd-kit/sortable';
import type { StagePropagation } from '@/dsp/chain/propagate';
import type { ChainIssue, StreamFormat } from '@/dsp/types';
import StageCell, { type StageActions } from './StageCell';
import FormatStrip, { FormatText } from './FormatStrip';
import StagePicker from './StagePicker';
import type { DraftDocument } from './draft';
import type { StageResponse } from './use-responses';
import type { PreviewState } from './use-preview';

interface CellsProps {
  doc: DraftDocument;
  input?: StreamFormat;
  inputLabel: string;
  propagation?: StagePropagation[];
  stageIssues: Map<string, ChainIssue[]>;
  responses: Map<string, StageResponse>;
  preview: PreviewState;
  readOnly: boolean;
  actions: StageActions;
  onAdd(kind: string, index?: number): void;
  onReorder(id: string, to: number): void;
}

export default function Cells({ doc, input, inputLabel, propagation, stageIssues, responses, preview, readOnly, actions, onAdd, onReorder }: CellsProps) {
  const sensors = useSensors(useSensor(PointerSensor, { activationConstraint: { distance: 4 } }), useSensor(KeyboardSensor, { coordinateGetter: sortableKeyboardCoordinates }));
  const onDragEnd = (event: DragEndEvent) => {
    const { active, over } = event;
    if (!over || active.id === over.id) return;
    const to = doc.stages.findIndex((s) => s.id === over.id);
    if (to >= 0) onReorder(String(active.id), to);
  };
  const onKeyDown = (event: React.KeyboardEvent) => {
    if (!event.altKey || (event.key !== 'ArrowUp' && event.key !== 'ArrowDown') || readOnly) return;
    const cell = (event.target as HTMLElement).closest<HTMLElement>('[data-stage-id]');
    if (!cell) return;
    event.preventDefault();
    const id = cell.dataset.stageId!;
    actions.move(id, event.key === 'ArrowUp' ? -1 : 1);
    // Keep the focus on the same control of the moved cell once it has re-rendered.
    const focused = document.activeElement as HTMLElement | null;
    requestAnimationFrame(() => focused?.focus());
  };
  const lastType = propagation && propagation.length > 0 ? propagation[propagation.length - 1].output.sampleType : input?.sampleType;

  return (
    <div onKeyDown={onKeyDown} data-testid="cells">
      <div className="mb-2 flex items-center gap-2 rounded-md border border-dashed border-line px-3 py-1.5 text-xs" role="group" aria-label="Chain input">
        <span className="font-semibold uppercase tracking-wide text-muted">Input</span>
        {input ? <FormatText format={input} /> : <span className="text-muted">unknown</span>}
        <span className="truncate text-muted">{inputLabel}</span>
      </div>
      <DndContext sensors={sensors} collisionDetection={closestCorners} onDragEnd={onDragEnd}>
        <SortableContext items={doc.stages.map((s) => s.id)} strategy={verticalListSortingStrategy}>
          {doc.stages.map((stage, index) => {
            const p = propagation?.[index]?.stageId === stage.id ? propagation[index] : undefined;
            const issues = stageIssues.get(stage.id) ?? [];
            const probe = preview.probes.get(stage.id);
            const previewError = preview.status === 'error' && preview.error?.stageId === stage.id ? preview.error.message : undefined;
            return (
              <div key={stage.id}>
                <StageCell
                  stage={stage}
                  index={index}
                  count={doc.stages.length}
                  input={p?.input}
                  issues={issues}
                  response={responses.get(stage.id)}
                  probe={probe}
                  probeStale={preview.stale}
                  previewError={previewError}
                  readOnly={readOnly}
                  actions={actions}
                />
                <FormatStrip input={p?.input} output={p?.output} issues={issues.filter((i) => i.code !== 'invalid-parameter' && i.code !== 'unknown-parameter')} label={`Output of ${stage.id}`} />
              </div>
            );
          })}
        </SortableContext>
      </DndContext>
      {!readOnly && (
        <div className="mt-2">
          <StagePicker inputType={lastType} onPick={(kind) => onAdd(kind)} initiallyOpen={doc.stages.length === 0} label="Add stage at the end" />
        </div>
      )}
      {doc.stages.length === 0 && readOnly && <p className="mt-3 text-sm text-muted">This revision has no stages.</p>}
    </div>
  );
}
