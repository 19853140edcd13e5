/**
 * The chain notebook (an island rendered only in the browser): loads a chain and its latest
 * revision, holds the document being edited as the one source of truth for the cells and the
 * JSON view, checks it on every edit, designs filter responses and previews the chain on the head
 * of a capture in workers, and saves revisions.
 */
import { lazy, Suspense, useCallback, useEffect, useMemo, useState } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import type { Capture, CaptureList } from '@/components/captures/types';
import { apiJson, ApiRequestError } from '@/components/query/fetch';
import { withQueryClient } from '@/components/table/withQueryClient';
import type { StreamFormat } from '@/dsp/types';
import { sameJsonValue } from '@/lib/chain-diff';
import { fetchChain, fetchRevision, useForkChain, useRestoreRevision, useSaveRevision, useUpdateChain, type ChainWithRevision } from './queries';
import { analyseDraft } from './analysis';
import Cells from './Cells';
import { addStage, duplicateStage, emptyDocument, moveStage, removeStage, setStageParams, toDraft, updateStage, type DraftDocument } from './draft';
import NotebookHeader, { type ViewMode } from './NotebookHeader';
import PreviewPanel from './PreviewPanel';
import RevisionsPanel from './RevisionsPanel';
import type { StageActions } from './StageCell';
import { usePreview } from './use-preview';
import { useResponses } from './use-responses';
import { previewCaptureSchema, streamFormatOf, type PreviewCapture } from '@/contracts/capture';

interface NotebookProps {
  chainId: string;
  user: { id: string; role: string };
}

// CodeMirror is about a third of the notebook's code: it loads when the JSON view first opens.
const JsonView = lazy(() => import('./JsonView'));

const captureKey = (chainId: string) => `quadrille.preview-capture.${chainId}`;

function Notebook({ chainId, user }: NotebookProps) {
  const client = useQueryClient();
  const [chain, setChain] = useState<ChainWithRevision | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [doc, setDoc] = useState<DraftDocument>(emptyDocument());
  const [saved, setSaved] = useState<DraftDocument | null>(null);
  const [viewing, setViewing] = useState<{ revision: number; doc: DraftDocument } | null>(null);
  const [editedAt, setEditedAt] = useState(0);
  const [mode, setMode] = useState<ViewMode>(() => (window.innerWidth >= 2200 ? 'split' : 'cells'));
  const [captureId, setCaptureId] = useState<string | null>(null);
  const [manualInput, setManualInput] = useState<StreamFormat>({ sampleRate: 4e6, sampleType: 'complex' });
  const [saving, setSaving] = useState(false);
  const [message, setMessage] = useState<{ tone: 'error' | 'ok'; text: string } | null>(null);
  const [jsonProblems, setJsonProblems] = useState<{ count: number; first?: string }>({ count: 0 });

  const saveRevision = useSaveRevision();
  const restoreRevision = useRestoreRevision();
  const forkChain = useForkChain();
  const updateChain = useUpdateChain();
  // The chain is read once into the editor's own state (the document being edited), through the
  // query cache; the capture list for the preview is an ordinary query.
  const loadChain = useCallback(async () => {
    let loaded: ChainWithRevision;
    try {
      loaded = await fetchChain(client, chainId);
    } catch (failure) {
      setLoadError(failure instanceof ApiRequestError && failure.status === 404 ? 'There is no such chain, or it is private to someone else.' : (failure as Error).message);
      return;
    }
    const draft = toDraft(loaded.revision.document) ?? emptyDocument(loaded.name);
    setChain(loaded);
    setDoc(draft);
    setSaved(draft);
    setViewing(null);
    document.title = `${loaded.name} · Chains · Quadrille`;
  }, [chainId, client]);
  const capturesQuery = useQuery({
    queryKey: ['captures', 'for-preview'],
    queryFn: () => apiJson<CaptureList>('GET', '/api/captures?pageSize=100&sort=name&order=asc').then((list) => list.items),
  });
  const captures: Capture[] | null = capturesQuery.data ?? (capturesQuery.isError ? [] : null);
  const capturesError = capturesQuery.isError ? `Captures could not be listed: ${capturesQuery.error.message}` : undefined;

  useEffect(() => {
    // Plotly is large: compile it while the page settles, not in the middle of someone's typing.
    const idle = window.requestIdleCallback ?? ((f: () => void) => setTimeout(f, 500));
    idle(() => void import('@/components/plots/plotly-component'));
  }, []);

  useEffect(() => {
    void loadChain();
  }, [loadChain]);

  // Pick the capture used last with this chain, else the first one the whole chain can take without errors.
  useEffect(() => {
    if (!captures || captureId !== null || !chain) return;
    const remembered = localStorage.getItem(captureKey(chainId));
    // Fewest errors first, then fewest warnings; list order breaks ties.
    const score = (c: Capture) => {
      const a = analyseDraft(doc, streamFormatOf(c));
      return a.errorCount * 1000 + a.warningCount;
    };
    const best = captures.map((c) => ({ c, s: score(c) })).sort((x, y) => x.s - y.s)[0]?.c;
    const choice = captures.find((c) => c.id === remembered) ?? best;
    if (choice) setCaptureId(choice.id);
  }, [captures, chain, chainId, captureId, doc]);

  const capture = captures?.find((c) => c.id === captureId) ?? null;
  const input: StreamFormat = capture ? streamFormatOf(capture) : manualInput;
  const inputKey = JSON.stringify(input);
  const stableInput = useMemo(() => input, [inputKey]); // eslint-disable-line react-hooks/exhaustive-deps
  const previewCapture = useMemo<PreviewCapture | null>(
    () => (capture ? previewCaptureSchema.parse(capture) : null),
    [capture],
  );

  const shown = viewing?.doc ?? doc;
  const readOnly = viewing !== null || !chain?.permissions.update;
  const analysis = useMemo(() => analyseDraft(shown, stableInput), [shown, stableInput]);
  const responses = useResponses(shown, analysis.propagation);
  // A chain with errors (bad parameters, or a stage fed a type it does not take) would only fail: wait for a fix.
  const preview = usePreview(analysis.parse.ok && analysis.errorCount === 0 ? analysis.parse.document : null, previewCapture, editedAt);
  const dirty = saved !== null && !sameJsonValue(doc, saved);

  const edit = useCallback((update: (d: DraftDocument) => DraftDocument) => {
    setDoc((d) => update(d));
    setEditedAt(performance.now());
    setMessage(null);
  }, []);

  const actions = useMemo<StageActions>(
    () => ({
      params: (id, params) => edit((d) => setStageParams(d, id, params)),
      toggle: (id, flag) => edit((d) => updateStage(d, id, (s) => ({ ...s, [flag]: !s[flag] }))),
      move: (id, delta) => edit((d) => moveStage(d, id, d.stages.findIndex((s) => s.id === id) + delta)),
      duplicate: (id) => edit((d) => duplicateStage(d, id).doc),
      remove: (id) => edit((d) => removeStage(d, id)),
    }),
    [edit],
  );

  const onAdd = useCallback(
    (kind: string) => {
      const last = analysis.propagation?.[analysis.propagation.length - 1]?.output ?? stableInput;
      edit((d) => addStage(d, kind, last).doc);
    },
    [analysis.propagation, stableInput, edit],
  );

  const saveBlocked = !analysis.parse.ok ? `Fix ${analysis.errorCount || 'the'} error${analysis.errorCount === 1 ? '' : 's'} first` : !dirty ? 'Nothing to save: no edits since the last revision' : null;

  const save = useCallback(
    async (text: string) => {
      if (!chain || saveBlocked) return;
      setSaving(true);
      try {
        const revision = await saveRevision.mutateAsync({ id: chain.id, document: { ...doc, name: chain.name }, message: text });
        setChain({ ...chain, latestRevision: revision.revision, revision });
        setSaved(doc);
        setMessage({ tone: 'ok', text: `Saved as revision ${revision.revision}.` });
      } catch (failure) {
        setMessage({ tone: 'error', text: (failure as Error).message });
      } finally {
        setSaving(false);
      }
    },
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [chain, doc, saveBlocked],
  );

  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if ((event.ctrlKey || event.metaKey) && event.key.toLowerCase() === 's') {
        event.preventDefault();
        if (!readOnly) void save('');
      }
    };
    const onLeave = (event: BeforeUnloadEvent) => {
      if (dirty) event.preventDefault();
    };
    window.addEventListener('keydown', onKey);
    window.addEventListener('beforeunload', onLeave);
    return () => {
      window.removeEventListener('keydown', onKey);
      window.removeEventListener('beforeunload', onLeave);
    };
  }, [save, readOnly, dirty]);

  const view = async (revision: number | null) => {
    if (revision === null) return setViewing(null);
    try {
      const found = await fetchRevision(client, chainId, revision);
      setViewing({ revision, doc: toDraft(found.document) ?? emptyDocument() });
    } catch (failure) {
      setMessage({ tone: 'error', text: (failure as Error).message });
    }
  };

  const restore = async () => {
    if (!viewing) return;
    try {
      const restored = await restoreRevision.mutateAsync({ id: chainId, revision: viewing.revision, message: `Restored revision ${viewing.revision}` });
      await loadChain();
      setMessage({ tone: 'ok', text: `Revision ${viewing.revision} restored as revision ${restored.revision}.` });
    } catch (failure) {
      setMessage({ tone: 'error', text: (failure as Error).message });
    }
  };

  const fork = async () => {
    forkChain.mutate({ id: chainId }, { onSuccess: (created) => (window.location.href = `/chains/${created.id}`), onError: (failure) => setMessage({ tone: 'error', text: failure.message }) });
  };

  const patch = async (body: { name?: string; visibility?: 'private' | 'team' }) => {
    if (!chain) return;
    try {
      const updated = await updateChain.mutateAsync({ id: chain.id, ...body });
      setChain({ ...chain, ...updated, revision: chain.revision });
      if (body.name) edit((d) => ({ ...d, name: body.name! }));
    } catch (failure) {
      setMessage({ tone: 'error', text: (failure as Error).message });
    }
  };

  if (loadError) return <p className="rounded-md border border-danger/40 bg-danger/10 px-3 py-2 text-sm text-danger">{loadError}</p>;
  if (!chain) return <p className="text-sm text-muted">Loading the chain…</p>;

  const blocked = analysis.errorCount > 0 ? `The chain has ${analysis.errorCount} error${analysis.errorCount === 1 ? '' : 's'}: the preview waits until they are fixed.` : undefined;
  const cells = (
    <Cells
      doc={shown}
      input={stableInput}
      inputLabel={capture ? `from ${capture.name}` : 'typed by hand (no capture)'}
      propagation={analysis.propagation}
      stageIssues={analysis.stageIssues}
      responses={responses}
      preview={preview}
      readOnly={readOnly}
      actions={actions}
      onAdd={onAdd}
      onReorder={(id, to) => edit((d) => moveStage(d, id, to))}
    />
  );
  const jsonView = (
    <div className="flex h-[calc(100vh-12rem)] min-h-[28rem] flex-col gap-1 xl:sticky xl:top-20">
      <p className={'text-xs ' + (jsonProblems.count ? 'text-danger' : 'text-muted')} data-testid="json-status">
        {jsonProblems.count ? `${jsonProblems.count} problem${jsonProblems.count > 1 ? 's' : ''}: ${jsonProblems.first}` : 'Valid chain document: edits apply to the cells as you type.'}
      </p>
      <Suspense fallback={<p className="text-sm text-muted">Loading the JSON editor…</p>}>
        <JsonView doc={shown} readOnly={readOnly} onApply={(d) => edit(() => d)} onDiagnostics={(count, first) => setJsonProblems({ count, first })} />
      </Suspense>
    </div>
  );

  return (
    <div data-notebook={chain.id} data-ready>
      <NotebookHeader
        chain={chain}
        isOwner={chain.owner.id === user.id}
        dirty={dirty}
        viewing={viewing?.revision ?? null}
        mode={mode}
        onMode={setMode}
        saveBlocked={saveBlocked}
        saving={saving}
        onSave={(text) => void save(text)}
        onRename={(name) => void patch({ name })}
        onVisibility={(visibility) => void patch({ visibility })}
        onFork={() => void fork()}
        onRestore={() => void restore()}
        onDiscard={() => (viewing ? setViewing(null) : saved && edit(() => saved))}
        message={message}
      />
      <div className="grid items-start gap-4 xl:grid-cols-[minmax(0,1fr)_20rem] 2xl:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="min-w-0">
          {mode === 'cells' && cells}
          {mode === 'json' && jsonView}
          {mode === 'split' && (
            <div className="grid items-start gap-4 lg:grid-cols-2">
              <div className="min-w-0">{cells}</div>
              <div className="min-w-0">{jsonView}</div>
            </div>
          )}
        </div>
        <aside className="space-y-4 xl:sticky xl:top-20">
          <PreviewPanel
            captures={captures}
            capturesError={capturesError}
            captureId={captureId}
            onCapture={(id) => {
              setCaptureId(id);
              if (id) localStorage.setItem(captureKey(chainId), id);
            }}
            manualInput={manualInput}
            onManualInput={setManualInput}
            preview={preview}
            blocked={capture ? blocked : undefined}
          />
          <IssueSummary errors={analysis.errorCount} warnings={analysis.warningCount} documentIssues={analysis.documentIssues.map((i) => i.message)} />
          <RevisionsPanel chainId={chain.id} latest={chain.latestRevision} viewing={viewing?.revision ?? null} onView={(n) => void view(n)} />
        </aside>
      </div>
    </div>
  );
}

function IssueSummary({ errors, warnings, documentIssues }: { errors: number; warnings: number; documentIssues: string[] }) {
  return (
    <section className="rounded-lg border border-line bg-panel p-3 text-xs" aria-label="Checks" data-testid="checks">
      <p>
        <span className={errors ? 'font-semibold text-danger' : 'text-ok'}>{errors ? `${errors} error${errors > 1 ? 's' : ''}` : 'No errors'}</span>
        <span className="text-muted"> · </span>
        <span className={warnings ? 'text-amber-700 dark:text-amber-400' : 'text-muted'}>{warnings ? `${warnings} warning${warnings > 1 ? 's' : ''}` : 'no warnings'}</span>
        <span className="text-muted"> (checked against the input format)</span>
      </p>
      {documentIssues.map((m) => (
        <p key={m} className="mt-1 text-danger">
          {m}
        </p>
      ))}
    </section>
  );
}

// Chain and revisions are read through the query cache; 30 s before a chain counts as stale.
export default withQueryClient(Notebook, 30_000);
