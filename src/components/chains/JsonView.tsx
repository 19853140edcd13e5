/**
 * The chain document as JSON text in CodeMirror 6. Problems are underlined where they are: a
 * syntax error at its offset, a validation problem at the value (or key) its field path names.
 * The text is applied to the document once it is valid; invalid text stays as typed, with its
 * diagnostics, until it is fixed. A change made elsewhere replaces the text unless the text already
 * says the same thing.
 */
import { useEffect, useRef } from 'react';
import { EditorState, Compartment, Annotation } from '@codemirror/state';
import { EditorView, keymap, lineNumbers, highlightActiveLine, highlightActiveLineGutter, drawSelection } from '@codemirror/view';
import { defaultKeymap, history, historyKeymap, indentWithTab } from '@codemirror/commands';
import { json } from '@codemirror/lang-json';
import { bracketMatching, foldGutter, foldKeymap, HighlightStyle, indentOnInput, syntaxHighlighting } from '@codemirror/language';
import { linter, lintGutter, type Diagnostic } from '@codemirror/lint';
import { tags } from '@lezer/highlight';
import { parseChainDocument } from '@/dsp/chain/parse';
import { sameJsonValue } from '@/lib/chain-diff';
import { draftJson, toDraft, type DraftDocument } from './draft';
import { JsonSyntaxError, locateIssue, nodeValue, parseJsonPositions } from './json-locate';

const fromOutside = Annotation.define<boolean>();
const APPLY_DELAY_MS = 300;

/** Diagnostics of a JSON text: the syntax error, or every validation problem at its place. */
export function jsonDiagnostics(text: string): Diagnostic[] {
  let root;
  try {
    root = parseJsonPositions(text);
  } catch (error) {
    if (error instanceof JsonSyntaxError) {
      const from = Math.min(error.offset, text.length);
      return [{ from, to: Math.min(text.length, from + 1), severity: 'error', message: error.message, source: 'JSON' }];
    }
    throw error;
  }
  const result = parseChainDocument(nodeValue(root));
  if (result.ok) return [];
  return result.issues.map((issue) => ({ ...locateIssue(root, issue), severity: issue.severity, message: issue.message, source: 'chain' }));
}

const highlight = HighlightStyle.define([
  { tag: tags.propertyName, color: 'rgb(var(--q-accent))' },
  { tag: tags.string, color: 'rgb(var(--q-ok))' },
  { tag: tags.number, color: '#c2410c' },
  { tag: [tags.bool, tags.null], color: '#7e22ce' },
  { tag: tags.punctuation, color: 'rgb(var(--q-muted))' },
]);

const theme = EditorView.theme({
  '&': { backgroundColor: 'rgb(var(--q-panel))', color: 'rgb(var(--q-ink))', fontSize: '13px', height: '100%' },
  '.cm-content': { fontFamily: '"JetBrains Mono Variable", ui-monospace, monospace', caretColor: 'rgb(var(--q-ink))' },
  '.cm-gutters': { backgroundColor: 'rgb(var(--q-surface))', color: 'rgb(var(--q-muted))', borderRight: '1px solid rgb(var(--q-line))' },
  '.cm-activeLine': { backgroundColor: 'rgb(var(--q-accent) / 0.06)' },
  '.cm-activeLineGutter': { backgroundColor: 'rgb(var(--q-accent) / 0.12)' },
  '&.cm-focused': { outline: 'none' },
  '.cm-selectionBackground, &.cm-focused .cm-selectionBackground': { backgroundColor: 'rgb(var(--q-accent) / 0.25) !important' },
  '.cm-tooltip': { backgroundColor: 'rgb(var(--q-panel))', border: '1px solid rgb(var(--q-line))', color: 'rgb(var(--q-ink))' },
  '.cm-scroller': { overflow: 'auto' },
});

interface JsonViewProps {
  doc: DraftDocument;
  readOnly: boolean;
  onApply(doc: DraftDocument): void;
  /** Text diagnostics after each check, for the summary line above the editor. */
  onDiagnostics?(count: number, first?: string): void;
}

export default function JsonView({ doc, readOnly, onApply, onDiagnostics }: JsonViewProps) {
  const host = useRef<HTMLDivElement>(null);
  const view = useRef<EditorView | null>(null);
  const readOnlyCompartment = useRef(new Compartment());
  const callbacks = useRef({ onApply, onDiagnostics });
  callbacks.current = { onApply, onDiagnostics };

  useEffect(() => {
    let timer: ReturnType<typeof setTimeout> | undefined;
    /** The edit still waiting for APPLY_DELAY_MS; run at once if the view closes first. */
    let pending: (() => void) | null = null;
    const check = linter((v) => {
      const diagnostics = jsonDiagnostics(v.state.doc.toString());
      callbacks.current.onDiagnostics?.(diagnostics.length, diagnostics[0]?.message);
      return diagnostics;
    }, { delay: 250 });
    const editor = new EditorView({
      parent: host.current!,
      state: EditorState.create({
        doc: draftJson(doc),
        extensions: [
          lineNumbers(),
          foldGutter(),
          lintGutter(),
          highlightActiveLine(),
          highlightActiveLineGutter(),
          drawSelection(),
          history(),
          indentOnInput(),
          bracketMatching(),
          json(),
          syntaxHighlighting(highlight),
          check,
          theme,
          keymap.of([...defaultKeymap, ...historyKeymap, ...foldKeymap, indentWithTab]),
          readOnlyCompartment.current.of([EditorState.readOnly.of(readOnly), EditorView.editable.of(!readOnly)]),
          EditorView.contentAttributes.of({ 'aria-label': 'Chain document as JSON', 'data-testid': 'json-editor' }),
          EditorView.updateListener.of((update) => {
            if (!update.docChanged || update.transactions.some((t) => t.annotation(fromOutside))) return;
            clearTimeout(timer);
            pending = () => {
              pending = null;
              const text = update.view.state.doc.toString();
              let value: unknown;
              try {
                value = JSON.parse(text);
              } catch {
                return;
              }
              const draft = toDraft(value);
              if (draft && parseChainDocument(value).ok) callbacks.current.onApply(draft);
            };
            timer = setTimeout(() => pending?.(), APPLY_DELAY_MS);
          }),
        ],
      }),
    });
    view.current = editor;
    return () => {
      clearTimeout(timer);
      // Switching to the cells right after typing must not drop the last edit.
      pending?.();
      editor.destroy();
      view.current = null;
    };
    // The editor is made once; later documents arrive through the effect below.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  useEffect(() => {
    const editor = view.current;
    if (!editor) return;
    const text = editor.state.doc.toString();
    let same = false;
    try {
      same = sameJsonValue(toDraft(JSON.parse(text)), doc);
    } catch {
      same = false;
    }
    if (same) return;
    editor.dispatch({ changes: { from: 0, to: text.length, insert: draftJson(doc) }, annotations: fromOutside.of(true) });
  }, [doc]);

  useEffect(() => {
    view.current?.dispatch({ effects: readOnlyCompartment.current.reconfigure([EditorState.readOnly.of(readOnly), EditorView.editable.of(!readOnly)]) });
  }, [readOnly]);

  return <div ref={host} className="h-full min-h-[24rem] overflow-hidden rounded-md border border-line" data-testid="json-view" />;
}
