import { useState, type SyntheticEvent } from 'react';
import type { PresentedAccount } from '@/lib/server/presenters/user';
import { Field, FormMessage } from '../forms/Field';
import { settled } from '@/components/query/fetch';
import { useCreateAccount } from '../account-queries';
import { ROLE_LABELS } from '../roles';
import { buttonPrimary, input as inputClass, label as labelClass } from '../ui';
import { MIN_PASSWORD_LENGTH as MIN_PASSWORD } from '@/lib/password-rules';

type FieldName = 'email' | 'name' | 'role' | 'password';
type Role = PresentedAccount['role'];

// The server's rule for new passwords; checked here too so the message comes before a round trip.

const EMPTY = { email: '', name: '', role: 'engineer' as Role, password: '' };

/** Form to create an account; the mutation puts the new account in the accounts list. */
export function CreateAccountForm({ ready }: { ready: boolean }) {
  const [values, setValues] = useState(EMPTY);
  const [errors, setErrors] = useState<Partial<Record<FieldName, string>>>({});
  const [message, setMessage] = useState<{ tone: 'error' | 'ok'; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const createAccount = useCreateAccount();

  const set = (name: FieldName) => (e: { target: { value: string } }) => setValues((v) => ({ ...v, [name]: e.target.value }));

  async function submit(event: SyntheticEvent<HTMLFormElement>) {
    event.preventDefault();
    setMessage(null);
    const found: Partial<Record<FieldName, string>> = {};
    if (!values.email.trim()) found.email = 'Enter the e-mail address of the new account.';
    if (!values.name.trim()) found.name = 'Enter the name people will see.';
    if (!values.password) found.password = 'Enter a first password to hand over.';
    else if (values.password.length < MIN_PASSWORD) found.password = `Use at least ${MIN_PASSWORD} characters.`;
    setErrors(found);
    if (Object.keys(found).length > 0) return;

    setBusy(true);
    const result = await settled(createAccount.mutateAsync({ email: values.email.trim(), name: values.name.trim(), role: values.role, password: values.password }));
    setBusy(false);
    if (result.ok) {
      const account = result.data;
      setValues(EMPTY);
      setMessage({
        tone: 'ok',
        text: `Account created for ${account.email} as ${ROLE_LABELS[account.role]}. Hand the first password over privately; it can be changed under Account.`,
      });
      return;
    }
    const { field, message: text } = result.error;
    if (field === 'email' || field === 'name' || field === 'role' || field === 'password') setErrors({ [field]: text });
    else setMessage({ tone: 'error', text });
  }

  return (
    <form method="post" onSubmit={submit} noValidate aria-label="Create an account" className="space-y-4" data-ready={ready || undefined}>
      {message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
      <Field label="E-mail" name="email" type="email" autoComplete="off" value={values.email} onChange={set('email')} error={errors.email} />
      <Field label="Name" name="name" autoComplete="off" value={values.name} onChange={set('name')} error={errors.name} />
      <div>
        <label htmlFor="new-account-role" className={labelClass}>
          Role
        </label>
        <select
          id="new-account-role"
          name="role"
          className={inputClass}
          value={values.role}
          onChange={set('role')}
          aria-invalid={errors.role ? true : undefined}
          aria-describedby={errors.role ? 'new-account-role-error' : undefined}
        >
          {(['engineer', 'operator', 'admin'] as const).map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </select>
        {errors.role && (
          <p id="new-account-role-error" className="mt-1 text-sm text-danger" data-field-error="role">
            {errors.role}
          </p>
        )}
      </div>
      <Field
        label="First password"
        name="password"
        type="password"
        autoComplete="new-password"
        value={values.password}
        onChange={set('password')}
        error={errors.password}
        hint={`At least ${MIN_PASSWORD} characters. The new user signs in with it and can change it on their Account page.`}
      />
      <button type="submit" className={buttonPrimary} disabled={busy || !ready}>
        {busy ? 'Creating…' : 'Create account'}
      </button>
    </form>
  );
}
