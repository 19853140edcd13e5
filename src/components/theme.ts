/** The user's theme choice: follow the operating system, or a fixed light or dark theme. */
export type ThemeChoice = 'system' | 'light' | 'dark';

/** localStorage key of the theme choice; the inline head script reads the same key before paint. */
export const THEME_STORAGE_KEY = 'quadrille-theme';

/** Read the remembered choice; 'system' when none is stored or storage is unavailable. */
export function readThemeChoice(): ThemeChoice {
  try {
    const stored = window.localStorage.getItem(THEME_STORAGE_KEY);
    return stored === 'light' || stored === 'dark' ? stored : 'system';
  } catch {
    return 'system';
  }
}

/** Apply a choice to <html data-theme> and remember it; 'system' removes both. */
export function applyThemeChoice(choice: ThemeChoice): void {
  const root = document.documentElement;
  if (choice === 'system') delete root.dataset.theme;
  else root.dataset.theme = choice;
  try {
    if (choice === 'system') window.localStorage.removeItem(THEME_STORAGE_KEY);
    else window.localStorage.setItem(THEME_STORAGE_KEY, choice);
  } catch {
    // Private windows may refuse storage: the theme still applies for this page.
  }
}
