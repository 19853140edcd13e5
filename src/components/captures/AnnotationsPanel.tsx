import { useMemo, useState } from 'react';
import type { ApiResult } from '@/components/query/fetch';
import { AnnotationEditor, type SaveOutcome } from './AnnotationEditor';
import { AnnotationsList } from './AnnotationsList';
import { ConfirmDialog } from './ConfirmDialog';
import { annotationValues, type AnnotationFormValues, emptyAnnotationValues, listWith, mergeAnnotation, placeServerError, type SigmfAnnotationObject } from './annotation-form';
import { readAnnotations, type Capture } from './types';

/** The open annotation form: which annotation (null for a new one) and the values it starts from. */
export interface EditingState {
  index: number | null;
  values: AnnotationFormValues;
  /** Changes when the form must start over (another annotation, another dragged box). */
  key: number;
}

export interface AnnotationsPanelProps {
  /** SigMF annotation objects as the API answers them. */
  raw: Record<string, unknown>[];
  capture: Pick<Capture, 'sampleRate' | 'sampleCount' | 'centerFrequency'>;
  /** Samples the quick look covers. */
  headSamples: number;
  /** Owner or admin: the list gets its edit controls. */
  canEdit: boolean;
  editing: EditingState | null;
  onEditingChange: (next: EditingState | null) => void;
  /** Sends the whole list (PATCH) and answers the API's outcome. */
  save: (list: Record<string, unknown>[]) => Promise<ApiResult<Capture>>;
  saving: boolean;
}

/**
 * The annotations of a capture with, for its owner or an admin, the form to add or edit one and
 * a confirmed delete. Every change sends the whole list, as the capture API takes it.
 */
export function AnnotationsPanel({ raw, capture, headSamples, canEdit, editing, onEditingChange, save, saving }: AnnotationsPanelProps) {
  const annotations = useMemo(() => readAnnotations(raw), [raw]);
  const [deleting, setDeleting] = useState<number | null>(null);
  const [deleteError, setDeleteError] = useState<string | null>(null);
  const context = useMemo(
    () => ({ sampleRate: capture.sampleRate, sampleCount: capture.sampleCount, centerFrequency: capture.centerFrequency }),
    [capture.sampleRate, capture.sampleCount, capture.centerFrequency],
  );

  async function saveOne(index: number | null, annotation: SigmfAnnotationObject): Promise<SaveOutcome> {
    const edited = mergeAnnotation(index === null ? undefined : raw[index], annotation);
    const { list, position } = listWith(raw, index, edited);
    const result = await save(list);
    if (result.ok) {
      onEditingChange(null);
      return { ok: true };
    }
    return { ok: false, ...placeServerError(result.error, position) };
  }

  async function confirmDelete() {
    if (deleting === null) return;
    setDeleteError(null);
    const result = await save(raw.filter((_, i) => i !== deleting));
    if (!result.ok) {
      setDeleteError(result.error.message);
      return;
    }
    // The open form keeps pointing at the same annotation, which moved up by one.
    if (editing?.index === deleting) onEditingChange(null);
    else if (editing && editing.index !== null && editing.index > deleting) onEditingChange({ ...editing, index: editing.index - 1 });
    setDeleting(null);
  }

  const controls = canEdit
    ? {
        onAdd: () => onEditingChange({ index: null, values: emptyAnnotationValues(), key: Date.now() }),
        onEdit: (index: number) => onEditingChange({ index, values: annotationValues(annotations[index], capture.sampleRate), key: Date.now() }),
        onDelete: (index: number) => {
          setDeleteError(null);
          setDeleting(index);
        },
        editingIndex: editing?.index ?? null,
        busy: saving,
      }
    : undefined;

  const deletingName = deleting === null ? '' : annotations[deleting]?.label || `Annotation ${deleting + 1}`;
  return (
    <>
      <AnnotationsList annotations={annotations} sampleRate={capture.sampleRate} headSamples={headSamples} controls={controls}>
        {canEdit && editing && (
          <AnnotationEditor
            key={editing.key}
            existing={editing.index !== null}
            initialValues={editing.values}
            capture={context}
            onSave={(annotation) => saveOne(editing.index, annotation)}
            onCancel={() => onEditingChange(null)}
          />
        )}
      </AnnotationsList>
      {canEdit && (
        <ConfirmDialog
          open={deleting !== null}
          title="Delete this annotation?"
          confirmLabel="Delete annotation"
          busy={saving}
          error={deleteError}
          onConfirm={confirmDelete}
          onCancel={() => setDeleting(null)}
        >
          <p>
            <span className="font-medium text-ink">{deletingName}</span> is removed from the capture's SigMF annotations.
          </p>
        </ConfirmDialog>
      )}
    </>
  );
}
