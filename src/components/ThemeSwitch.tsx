import { useEffect, useState, type ReactNode } from 'react';
import { applyThemeChoice, readThemeChoice, type ThemeChoice } from './theme';

const CHOICES: { value: ThemeChoice; label: string; icon: ReactNode }[] = [
  {
    value: 'system',
    label: 'Follow the system theme',
    icon: (
      <path d="M3 4.5h14v9H3zM7.5 16.5h5M10 13.5v3" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
    ),
  },
  {
    value: 'light',
    label: 'Light theme',
    icon: (
      <g fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round">
        <circle cx="10" cy="10" r="3.2" />
        <path d="M10 2.5v1.8M10 15.7v1.8M2.5 10h1.8M15.7 10h1.8M4.7 4.7l1.3 1.3M14 14l1.3 1.3M4.7 15.3L6 14M14 6l1.3-1.3" />
      </g>
    ),
  },
  {
    value: 'dark',
    label: 'Dark theme',
    icon: (
      <path d="M15.5 12.5A6 6 0 0 1 7.5 4.5a6 6 0 1 0 8 8z" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
    ),
  },
];

/** Three-way theme switch (system, light, dark), remembered in localStorage. */
export default function ThemeSwitch() {
  // The server cannot know the stored choice: start at 'system' and correct after mounting.
  const [choice, setChoice] = useState<ThemeChoice>('system');
  useEffect(() => setChoice(readThemeChoice()), []);

  function choose(next: ThemeChoice) {
    applyThemeChoice(next);
    setChoice(next);
  }

  return (
    <div role="group" aria-label="Theme" className="flex items-center rounded-md border border-line bg-surface p-0.5">
      {CHOICES.map((c) => (
        <button
          key={c.value}
          type="button"
          aria-pressed={choice === c.value}
          aria-label={c.label}
          title={c.label}
          data-theme-choice={c.value}
          onClick={() => choose(c.value)}
          className={
            'grid h-7 w-7 place-items-center rounded transition-colors ' +
            (choice === c.value ? 'bg-panel text-ink shadow-sm ring-1 ring-line' : 'text-muted hover:text-ink')
          }
        >
          <svg viewBox="0 0 20 20" className="h-4 w-4" aria-hidden="true">
            {c.icon}
          </svg>
        </button>
      ))}
    </div>
  );
}
