/**
 * Plot colours taken from the page's theme variables (src/styles/global.css), so plots follow the
 * light and dark themes and the user's switch without a colour table of their own.
 */
import { useEffect, useState } from 'react';

/** Colours (CSS colour strings) a plot needs from the page theme. */
export interface PlotTheme {
  dark: boolean;
  ink: string;
  muted: string;
  line: string;
  panel: string;
  accent: string;
  danger: string;
  ok: string;
  /** Trace colours in order: accent first, then colours that stay apart in both themes. */
  series: string[];
}

function cssColour(style: CSSStyleDeclaration, name: string, alpha = 1): string {
  const triplet = style.getPropertyValue(name).trim().split(/\s+/).join(', ');
  return triplet ? `rgba(${triplet}, ${alpha})` : '';
}

/** Reads the theme variables now in force on <html>. */
export function readPlotTheme(): PlotTheme {
  const style = getComputedStyle(document.documentElement);
  const dark = style.colorScheme === 'dark' || document.documentElement.dataset.theme === 'dark';
  return {
    dark,
    ink: cssColour(style, '--q-ink'),
    muted: cssColour(style, '--q-muted'),
    line: cssColour(style, '--q-line'),
    panel: cssColour(style, '--q-panel'),
    accent: cssColour(style, '--q-accent'),
    danger: cssColour(style, '--q-danger'),
    ok: cssColour(style, '--q-ok'),
    // I in the accent, Q in an orange that contrasts with it in both themes, then further series.
    series: [cssColour(style, '--q-accent'), dark ? 'rgba(251, 146, 60, 1)' : 'rgba(194, 65, 12, 1)', dark ? 'rgba(192, 132, 252, 1)' : 'rgba(126, 34, 206, 1)'],
  };
}

/** The current plot theme, updated when the user switches theme or the system scheme changes. */
export function usePlotTheme(): PlotTheme {
  const [theme, setTheme] = useState<PlotTheme>(() => readPlotTheme());
  useEffect(() => {
    const update = () => setTheme(readPlotTheme());
    const observer = new MutationObserver(update);
    observer.observe(document.documentElement, { attributes: true, attributeFilter: ['data-theme'] });
    const media = window.matchMedia('(prefers-color-scheme: dark)');
    media.addEventListener('change', update);
    return () => {
      observer.disconnect();
      media.removeEventListener('change', update);
    };
  }, []);
  return theme;
}
