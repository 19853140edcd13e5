import { useEffect, useRef, useState, type SyntheticEvent } from 'react';
import { Field, FormMessage } from './forms/Field';
import { settled } from '@/components/query/fetch';
import { useSignIn } from './account-queries';
import { withQueryClient } from './table/withQueryClient';
import { buttonPrimary } from './ui';

type FieldName = 'email' | 'password';

export interface SignInFormProps {
  /** Where to go after signing in: a path on this site, already checked by the page. */
  next: string;
}

/** E-mail and password form; posts JSON to /api/auth/sign-in and shows each error beside its field. */
function SignInForm({ next }: SignInFormProps) {
  const signIn = useSignIn();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [fieldErrors, setFieldErrors] = useState<Partial<Record<FieldName, string>>>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  // Until React has hydrated, a click would submit the plain HTML form: keep the button disabled.
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);
  const emailRef = useRef<HTMLInputElement>(null);
  const passwordRef = useRef<HTMLInputElement>(null);

  function focusField(field: FieldName) {
    (field === 'email' ? emailRef : passwordRef).current?.focus();
  }

  async function submit(event: SyntheticEvent<HTMLFormElement>) {
    event.preventDefault();
    const missing: Partial<Record<FieldName, string>> = {};
    if (!email.trim()) missing.email = 'Enter the e-mail address of your account.';
    if (!password) missing.password = 'Enter your password.';
    setFormError(null);
    setFieldErrors(missing);
    if (missing.email || missing.password) {
      focusField(missing.email ? 'email' : 'password');
      return;
    }

    setBusy(true);
    const result = await settled(signIn.mutateAsync({ email: email.trim(), password }));
    if (result.ok) {
      window.location.assign(next);
      return;
    }
    setBusy(false);
    const { code, message } = result.error;
    // The server does not say which of the two was wrong (that would reveal which e-mails have
    // accounts); the password is what people retype, so the message goes beside it.
    const field = code === 'invalid_credentials' ? 'password' : result.error.field;
    if (field === 'email' || field === 'password') {
      setFieldErrors({ [field]: message });
      focusField(field);
    } else {
      setFormError(message);
    }
  }

  return (
    <form method="post" onSubmit={submit} noValidate className="space-y-4" aria-label="Sign in" data-ready={ready || undefined}>
      {formError && <FormMessage tone="error">{formError}</FormMessage>}
      <Field
        ref={emailRef}
        label="E-mail"
        name="email"
        type="email"
        autoComplete="username"
        autoFocus
        value={email}
        onChange={(e) => setEmail(e.target.value)}
        error={fieldErrors.email}
      />
      <Field
        ref={passwordRef}
        label="Password"
        name="password"
        type="password"
        autoComplete="current-password"
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        error={fieldErrors.password}
      />
      <button type="submit" className={buttonPrimary + ' w-full'} disabled={busy || !ready}>
        {busy ? 'Signing in…' : 'Sign in'}
      </button>
    </form>
  );
}

export default withQueryClient(SignInForm, 0);
