/** Hooks of the run screens: live status over server-sent events, plot widths, reduced plot data, submission. */
import { useEffect, useRef, useState, type RefObject } from 'react';
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { eventsUrl, fetchPlot, submitRuns } from './api';
import { isActive, type PlotKind, type Run, type RunStatusEvent } from './types';

/**
 * Keeps the cached run `['run', id]` live while it is queued or running: each `status` event
 * updates progress, stage and time left at once; a change of status or the `done` event reloads
 * the run (timings, error, results).
 */
export function useRunEvents(id: string, active: boolean): void {
  const queryClient = useQueryClient();
  useEffect(() => {
    if (!active || typeof EventSource === 'undefined') return;
    const source = new EventSource(eventsUrl(id));
    const reload = () => void queryClient.invalidateQueries({ queryKey: ['run', id] });
    source.addEventListener('status', (event) => {
      let payload: RunStatusEvent;
      try {
        payload = JSON.parse((event as MessageEvent<string>).data) as RunStatusEvent;
      } catch {
        return;
      }
      let changed = false;
      queryClient.setQueryData<Run>(['run', id], (old) => {
        if (!old) return old;
        changed = old.status !== payload.status;
        return { ...old, ...payload };
      });
      if (changed || !isActive(payload.status)) reload();
    });
    source.addEventListener('done', () => {
      source.close();
      reload();
    });
    return () => source.close();
  }, [id, active, queryClient]);
}

// Plot margins (px) left of and right of the plotting area, and the step widths are rounded to,
// so a window resized by a few pixels does not fetch the data again.
const PLOT_MARGINS_PX = 76;
const WIDTH_STEP_PX = 40;

/**
 * A ref for a plot's container and the width (CSS px) of its plotting area, rounded down to a
 * step: the number of points to ask the server for, so a plot never gets more points than pixels.
 * `insetPx` is what lies between the measured box and the plot (card padding). 0 until measured.
 */
export function usePlotWidth<T extends HTMLElement>(insetPx = 0): [RefObject<T | null>, number] {
  const ref = useRef<T>(null);
  const [width, setWidth] = useState(0);
  useEffect(() => {
    const element = ref.current;
    if (!element) return;
    const measure = () => {
      const inner = element.clientWidth - insetPx - PLOT_MARGINS_PX;
      setWidth(Math.max(WIDTH_STEP_PX * 2, Math.floor(inner / WIDTH_STEP_PX) * WIDTH_STEP_PX));
    };
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(element);
    return () => observer.disconnect();
  }, [insetPx]);
  return [ref, width];
}

/** Reduced plot data of one probe of a succeeded run, at `width` points (px); waits for a width. */
export function usePlotData<K extends PlotKind>(runId: string, probe: string, kind: K, width: number) {
  return useQuery({
    queryKey: ['plot', runId, probe, kind, width],
    queryFn: () => fetchPlot(runId, probe, kind, width),
    enabled: width > 0,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
}

/** Milliseconds since the epoch, ticking every second while `running` (durations of running runs). */
export function useClock(running: boolean): number | null {
  // null until mounted: the server's clock and the browser's differ, and a time-so-far rendered
  // from each would not match when the page hydrates.
  const [now, setNow] = useState<number | null>(null);
  useEffect(() => {
    setNow(Date.now());
    if (!running) return;
    const timer = setInterval(() => setNow(Date.now()), 1_000);
    return () => clearInterval(timer);
  }, [running]);
  return now;
}

/** Queues one run per capture of a chain revision; the runs lists are refreshed once it went through. */
export function useSubmitRuns() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ chainId, revision, captureIds }: { chainId: string; revision: number | undefined; captureIds: string[] }) => submitRuns(chainId, revision, captureIds),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['runs'] }),
  });
}
