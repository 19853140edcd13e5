/**
 * Shared class lists for controls, so Astro pages and React islands look alike. Primary buttons
 * write in the panel colour on the accent: white on teal in light, near-black on sky in dark,
 * readable in both themes. A disabled one turns grey rather than faint: a faded sky button on
 * the dark panel still read as enabled.
 */
export const buttonPrimary =
  'inline-flex items-center justify-center gap-2 rounded-md bg-accent px-3.5 py-2 text-sm font-medium text-panel hover:bg-accent/90 disabled:cursor-not-allowed disabled:bg-line disabled:text-muted disabled:hover:bg-line';

/** A quiet bordered button for secondary actions. */
export const buttonSecondary =
  'inline-flex items-center justify-center gap-2 rounded-md border border-line bg-panel px-3.5 py-2 text-sm font-medium text-ink hover:bg-surface disabled:cursor-not-allowed disabled:opacity-60';

/** A small bordered button for row actions in tables. */
export const buttonSmall =
  'inline-flex items-center justify-center rounded border border-line bg-panel px-2 py-1 text-xs font-medium text-ink hover:bg-surface disabled:cursor-not-allowed disabled:opacity-50';

/** Text inputs and selects; the invalid state is driven by aria-invalid. */
export const input =
  'block w-full rounded-md border border-muted/40 bg-surface px-3 py-2 text-sm text-ink placeholder:text-muted/70 focus:border-accent aria-[invalid=true]:border-danger';

/** Field labels above inputs. */
export const label = 'mb-1 block text-sm font-medium';
