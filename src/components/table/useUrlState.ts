/**
 * A list's state kept in the address bar. The server page parses the URL with the same codec and
 * hands the result in as `initial`, so the first render matches the server's HTML; from then on
 * the island owns the URL.
 */
import { useCallback, useEffect, useRef, useState } from 'react';
import type { UrlCodec } from './url-state';

/**
 * `push` makes a history entry (page, sort, a chosen filter: Back steps through them); `replace`
 * rewrites the current one after a pause (typing), so each keystroke is not a step of its own.
 */
export type HistoryMode = 'push' | 'replace';

export interface UrlState<S> {
  /** What the inputs show, updated at once. */
  state: S;
  /** What the URL and the list request follow: `state` once typing has paused. */
  settled: S;
  /** Sets the state; `push` writes the URL now, `replace` after `typingPauseMs`. */
  update: (next: S | ((current: S) => S), mode: HistoryMode) => void;
}

function writeUrl(search: string, mode: HistoryMode): void {
  const url = window.location.pathname + (search ? `?${search}` : '') + window.location.hash;
  if (url === window.location.pathname + window.location.search + window.location.hash) return;
  if (mode === 'push') window.history.pushState(window.history.state, '', url);
  else window.history.replaceState(window.history.state, '', url);
}

/** State of a list kept in the query string; `codec` must be stable (a module constant or memoised). */
export function useUrlState<S>(codec: UrlCodec<S>, initial: S, typingPauseMs = 300): UrlState<S> {
  const [state, setState] = useState(initial);
  const [settled, setSettled] = useState(initial);
  const latest = useRef(initial);
  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);

  useEffect(() => {
    // A hand-edited link with values the codec dropped now shows the address of what is listed.
    writeUrl(codec.serialize(latest.current), 'replace');
    const restore = () => {
      clearTimeout(timer.current);
      const restored = codec.parse(window.location.search);
      latest.current = restored;
      setState(restored);
      setSettled(restored);
    };
    window.addEventListener('popstate', restore);
    return () => {
      window.removeEventListener('popstate', restore);
      clearTimeout(timer.current);
    };
  }, [codec]);

  const update = useCallback(
    (next: S | ((current: S) => S), mode: HistoryMode) => {
      const value = typeof next === 'function' ? (next as (current: S) => S)(latest.current) : next;
      latest.current = value;
      setState(value);
      clearTimeout(timer.current);
      const settle = () => {
        setSettled(value);
        writeUrl(codec.serialize(value), mode);
      };
      if (mode === 'push') settle();
      else timer.current = setTimeout(settle, typingPauseMs);
    },
    [codec, typingPauseMs],
  );

  return { state, settled, update };
}
