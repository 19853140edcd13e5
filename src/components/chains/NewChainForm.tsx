/** Starts a chain: a name, who sees it and an optional description; it opens in the notebook, empty. */
import { useState } from 'react';
import { Field, FormMessage } from '@/components/forms/Field';
import { buttonPrimary, label as labelClass, input as inputClass } from '@/components/ui';
import { emptyDocument } from './draft';
import { withQueryClient } from '@/components/table/withQueryClient';
import { ApiRequestError } from '@/components/query/fetch';
import { useCreateChain } from './queries';

function NewChainForm() {
  const create = useCreateChain();
  const [name, setName] = useState('');
  const [visibility, setVisibility] = useState<'private' | 'team'>('private');
  const [description, setDescription] = useState('');
  const [error, setError] = useState<{ field?: string | null; message: string } | null>(null);
  const [busy, setBusy] = useState(false);

  const submit = async (event: React.SyntheticEvent<HTMLFormElement>) => {
    event.preventDefault();
    if (!name.trim()) return setError({ field: 'name', message: 'Name: enter a name for the chain.' });
    setBusy(true);
    try {
      const created = await create.mutateAsync({ name: name.trim(), visibility, document: emptyDocument(name.trim()), ...(description.trim() ? { description: description.trim() } : {}) });
      window.location.href = `/chains/${created.id}`;
    } catch (failure) {
      setBusy(false);
      setError({ field: failure instanceof ApiRequestError ? failure.field : null, message: (failure as Error).message });
    }
  };

  return (
    <form onSubmit={(e) => void submit(e)} className="max-w-xl space-y-4" data-ready noValidate>
      <Field label="Name" name="name" value={name} onChange={(e) => setName(e.target.value)} maxLength={200} autoFocus error={error?.field === 'name' ? error.message : null} hint="e.g. Beacon down-conversion, rev B" />
      <fieldset>
        <legend className={labelClass}>Visibility</legend>
        <div className="flex gap-4 text-sm">
          {(['private', 'team'] as const).map((v) => (
            <label key={v} className="flex items-center gap-2">
              <input type="radio" name="visibility" value={v} checked={visibility === v} onChange={() => setVisibility(v)} />
              {v === 'private' ? 'Private: only you' : 'Team: everyone signed in reads it'}
            </label>
          ))}
        </div>
      </fieldset>
      <div>
        <label htmlFor="description" className={labelClass}>
          Description <span className="font-normal text-muted">(optional)</span>
        </label>
        <textarea id="description" className={inputClass} rows={3} value={description} onChange={(e) => setDescription(e.target.value)} maxLength={10_000} />
      </div>
      {error && error.field !== 'name' && <FormMessage tone="error">{error.message}</FormMessage>}
      <button type="submit" className={buttonPrimary} disabled={busy}>
        {busy ? 'Creating…' : 'Create and open'}
      </button>
    </form>
  );
}

export default withQueryClient(NewChainForm, 0);
