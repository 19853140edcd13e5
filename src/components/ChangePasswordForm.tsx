import { useEffect, useState, type SyntheticEvent } from 'react';
import { Field, FormMessage } from './forms/Field';
import { requestJson } from './forms/api';
import { buttonPrimary } from './ui';

// The server's rule for new passwords; checked here too so the message comes before a round trip.
const MIN_PASSWORD = 10;

type FieldName = 'currentPassword' | 'newPassword' | 'confirmPassword';

/** Change-password form: posts to /api/account/password and shows each error beside its field. */
export default function ChangePasswordForm() {
  const [values, setValues] = useState<Record<FieldName, string>>({ currentPassword: '', newPassword: '', confirmPassword: '' });
  const [errors, setErrors] = useState<Partial<Record<FieldName, string>>>({});
  const [formMessage, setFormMessage] = useState<{ tone: 'error' | 'ok'; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  const bind = (name: FieldName) => ({
    name,
    value: values[name],
    onChange: (e: { target: { value: string } }) => setValues((v) => ({ ...v, [name]: e.target.value })),
    error: errors[name],
  });

  async function submit(event: SyntheticEvent<HTMLFormElement>) {
    event.preventDefault();
    setFormMessage(null);
    const found: Partial<Record<FieldName, string>> = {};
    if (!values.currentPassword) found.currentPassword = 'Enter your current password.';
    if (!values.newPassword) found.newPassword = 'Enter a new password.';
    else if (values.newPassword.length < MIN_PASSWORD) found.newPassword = `Use at least ${MIN_PASSWORD} characters.`;
    else if (values.newPassword === values.currentPassword) found.newPassword = 'The new password is the same as the current one.';
    if (values.newPassword && values.confirmPassword !== values.newPassword) found.confirmPassword = 'This does not match the new password.';
    setErrors(found);
    if (Object.keys(found).length > 0) return;

    setBusy(true);
    const result = await requestJson('POST', '/api/account/password', {
      currentPassword: values.currentPassword,
      newPassword: values.newPassword,
    });
    setBusy(false);
    if (result.ok) {
      setValues({ currentPassword: '', newPassword: '', confirmPassword: '' });
      setFormMessage({ tone: 'ok', text: 'Password changed. Use the new password next time you sign in.' });
      return;
    }
    const { field, message } = result.error;
    if (field === 'currentPassword' || field === 'newPassword') setErrors({ [field]: message });
    else setFormMessage({ tone: 'error', text: message });
  }

  return (
    <form method="post" onSubmit={submit} noValidate className="max-w-md space-y-4" aria-label="Change password" data-ready={ready || undefined}>
      {formMessage && <FormMessage tone={formMessage.tone}>{formMessage.text}</FormMessage>}
      <Field label="Current password" type="password" autoComplete="current-password" {...bind('currentPassword')} />
      <Field label="New password" type="password" autoComplete="new-password" {...bind('newPassword')} />
      <Field label="Repeat the new password" type="password" autoComplete="new-password" {...bind('confirmPassword')} />
      <button type="submit" className={buttonPrimary} disabled={busy || !ready}>
        {busy ? 'Changing…' : 'Change password'}
      </button>
    </form>
  );
}
