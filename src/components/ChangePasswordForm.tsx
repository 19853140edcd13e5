import { useState, type SyntheticEvent } from 'react';
import { Field, FormMessage } from './forms/Field';
import { settled } from '@/components/query/fetch';
import { useChangePassword } from './account-queries';
import { withQueryClient } from './table/withQueryClient';
import { MIN_PASSWORD, useFormFields } from './forms/useFormFields';
import { buttonPrimary } from './ui';

type FieldName = 'currentPassword' | 'newPassword' | 'confirmPassword';

/** Change-password form: posts to /api/account/password and shows each error beside its field. */
function ChangePasswordForm() {
  const changePassword = useChangePassword();
  const { values, setValues, setErrors, busy, setBusy, ready, bind } = useFormFields<FieldName>({ currentPassword: '', newPassword: '', confirmPassword: '' });
  const [formMessage, setFormMessage] = useState<{ tone: 'error' | 'ok'; text: string } | null>(null);

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
    const result = await settled(changePassword.mutateAsync({ currentPassword: values.currentPassword, newPassword: values.newPassword }));
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

export default withQueryClient(ChangePasswordForm, 0);
