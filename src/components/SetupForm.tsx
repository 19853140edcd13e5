import { useState, type SyntheticEvent } from 'react';
import { Field, FormMessage } from './forms/Field';
import { settled } from '@/components/query/fetch';
import { useSetup } from './account-queries';
import { withQueryClient } from './table/withQueryClient';
import { MIN_PASSWORD, useFormFields } from './forms/useFormFields';
import { buttonPrimary } from './ui';

type FieldName = 'email' | 'name' | 'password';

/** First-run form on an installation without accounts: creates the admin via /api/setup and signs it in. */
function SetupForm() {
  const setup = useSetup();
  const { values, setErrors, busy, setBusy, ready, bind } = useFormFields<FieldName>({ email: '', name: '', password: '' });
  const [formError, setFormError] = useState<string | null>(null);

  async function submit(event: SyntheticEvent<HTMLFormElement>) {
    event.preventDefault();
    setFormError(null);
    const found: Partial<Record<FieldName, string>> = {};
    if (!values.email.trim()) found.email = 'Enter your e-mail address.';
    if (!values.name.trim()) found.name = 'Enter the name people will see.';
    if (values.password.length < MIN_PASSWORD) found.password = `Use at least ${MIN_PASSWORD} characters.`;
    setErrors(found);
    if (Object.keys(found).length > 0) return;

    setBusy(true);
    const result = await settled(setup.mutateAsync({ email: values.email.trim(), name: values.name.trim(), password: values.password }));
    if (result.ok) {
      window.location.assign('/');
      return;
    }
    setBusy(false);
    const { field, message } = result.error;
    if (field === 'email' || field === 'name' || field === 'password') setErrors({ [field]: message });
    else setFormError(message);
  }

  return (
    <form method="post" onSubmit={submit} noValidate className="space-y-4" aria-label="Create the first account" data-ready={ready || undefined}>
      {formError && <FormMessage tone="error">{formError}</FormMessage>}
      <Field label="E-mail" type="email" autoComplete="username" autoFocus {...bind('email')} />
      <Field label="Name" autoComplete="name" {...bind('name')} />
      <Field label="Password" type="password" autoComplete="new-password" hint={`At least ${MIN_PASSWORD} characters.`} {...bind('password')} />
      <button type="submit" className={buttonPrimary + ' w-full'} disabled={busy || !ready}>
        {busy ? 'Creating…' : 'Create the admin account'}
      </button>
    </form>
  );
}

export default withQueryClient(SetupForm, 0);
