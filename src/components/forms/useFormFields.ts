import { useEffect, useState } from 'react';

/** The server's rule for new passwords (newPasswordField), in characters; checked here too so the message comes before a round trip. */
export { MIN_PASSWORD_LENGTH as MIN_PASSWORD } from '@/lib/password-rules';

/**
 * State of a small form of text fields: their values, the error beside each, `busy` while the
 * form is sent and `ready` once React has attached (tests and the submit button wait for it).
 * `bind(name)` gives a <Field> its name, value, change handler and error.
 */
export function useFormFields<Name extends string>(empty: Record<Name, string>) {
  const [values, setValues] = useState<Record<Name, string>>(empty);
  const [errors, setErrors] = useState<Partial<Record<Name, string>>>({});
  const [busy, setBusy] = useState(false);
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  const bind = (name: Name) => ({
    name,
    value: values[name],
    onChange: (e: { target: { value: string } }) => setValues((v) => ({ ...v, [name]: e.target.value })),
    error: errors[name],
  });

  return { values, setValues, errors, setErrors, busy, setBusy, ready, bind };
}
