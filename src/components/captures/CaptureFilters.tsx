import { useId } from 'react';
import { SIGMF_DATATYPES } from '@/dsp/formats/datatype';
import { buttonSmall, input } from '../ui';
import { emptyFilters, hasFilters, parseRate, type FilterValues } from './list-state';
import { LAYOUT_LABELS } from './types';

const small = input.replace('px-3 py-2', 'px-2.5 py-1.5');

/** Search, owner, tag, layout, datatype and sample-rate range of the captures list. */
export function CaptureFilters({ values, onChange }: { values: FilterValues; onChange: (next: FilterValues) => void }) {
  const id = useId();
  const set = (key: keyof FilterValues) => (event: { target: { value: string } }) => onChange({ ...values, [key]: event.target.value });
  const minRate = parseRate(values.minRate);
  const maxRate = parseRate(values.maxRate);
  const active = hasFilters(values);
  return (
    <fieldset className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4 2xl:grid-cols-[minmax(14rem,2fr)_repeat(6,minmax(0,1fr))_auto]" aria-label="Filter captures">
      <legend className="sr-only">Filter captures</legend>
      <label className="block text-xs font-medium text-muted">
        Search
        <input type="search" className={small + ' mt-1'} placeholder="Name, notes or tag" value={values.q} onChange={set('q')} />
      </label>
      <label className="block text-xs font-medium text-muted">
        Owner
        <select className={small + ' mt-1'} value={values.owner} onChange={set('owner')}>
          <option value="">Anyone</option>
          <option value="me">Mine</option>
          <option value="team">Team-visible</option>
        </select>
      </label>
      <label className="block text-xs font-medium text-muted">
        Tag
        <input className={small + ' mt-1'} placeholder="e.g. rev-a" value={values.tag} onChange={set('tag')} />
      </label>
      <label className="block text-xs font-medium text-muted">
        Layout
        <select className={small + ' mt-1'} value={values.layout} onChange={set('layout')}>
          <option value="">Any layout</option>
          {Object.entries(LAYOUT_LABELS).map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </select>
      </label>
      <label className="block text-xs font-medium text-muted">
        Datatype
        <select className={small + ' mt-1 font-mono'} value={values.datatype} onChange={set('datatype')}>
          <option value="">Any datatype</option>
          {SIGMF_DATATYPES.map((d) => (
            <option key={d} value={d}>
              {d}
            </option>
          ))}
        </select>
      </label>
      <RateField id={`${id}-min`} label="Rate from" value={values.minRate} error={minRate.error} onChange={set('minRate')} />
      <RateField id={`${id}-max`} label="Rate to" value={values.maxRate} error={maxRate.error} onChange={set('maxRate')} />
      <div className="flex items-start pt-5">
        <button type="button" className={buttonSmall + ' h-[2.125rem] px-3'} disabled={!active} onClick={() => onChange(emptyFilters)}>
          Clear filters
        </button>
      </div>
    </fieldset>
  );
}

function RateField({ id, label, value, error, onChange }: { id: string; label: string; value: string; error?: string; onChange: (e: { target: { value: string } }) => void }) {
  return (
    <div>
      <label htmlFor={id} className="block text-xs font-medium text-muted">
        {label}
      </label>
      <input
        id={id}
        className={small + ' mt-1 font-mono'}
        placeholder="e.g. 4 MHz"
        value={value}
        onChange={onChange}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
      />
      {error && (
        <p id={`${id}-error`} className="mt-1 text-xs text-danger">
          {error}
        </p>
      )}
    </div>
  );
}
