import { useState, type FormEvent } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { Button, ErrorState, Field, inputClass, Notice } from '../../components/ui.js';
import { PASSWORD_MIN_LENGTH } from '../../../shared/auth/password-policy.js';
import { useSetPassword } from './api/sign-in.js';

/** Choosing a password from an e-mailed link: an invitation or a reset. */
export function SetPasswordPage({ kind }: { kind: 'reset' | 'invite' }) {
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const mutation = useSetPassword(kind);
  const mismatch = repeat.length > 0 && repeat !== password;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!mismatch) mutation.mutate({ token, password });
  };
  return (
    <main className="flex min-h-screen items-center justify-center bg-surface p-4">
      <form onSubmit={submit} className="flex w-full max-w-sm flex-col gap-4 rounded border border-line bg-panel p-5">
        <h1 className="text-lg font-semibold">{kind === 'invite' ? 'Welcome to Alveolog: choose your password' : 'Choose a new password'}</h1>
        {!token && <Notice tone="danger">This link is incomplete. Open it again from the e-mail.</Notice>}
        {mutation.isSuccess ? (
          <Notice tone="ok">Your password is set. <Link className="font-semibold underline" to="/sign-in">Sign in</Link></Notice>
        ) : (
          <>
            <Field label="New password" htmlFor="new-password" hint={`At least ${PASSWORD_MIN_LENGTH} characters; a short sentence of unrelated words works well.`}>
              <input id="new-password" type="password" autoComplete="new-password" minLength={PASSWORD_MIN_LENGTH} required className={inputClass} value={password} onChange={(e) => setPassword(e.target.value)} />
            </Field>
            <Field label="Repeat it" htmlFor="repeat-password" error={mismatch ? 'the two entries differ' : undefined}>
              <input id="repeat-password" type="password" autoComplete="new-password" required className={inputClass} value={repeat} onChange={(e) => setRepeat(e.target.value)} />
            </Field>
            {mutation.error && <ErrorState error={mutation.error} />}
            <Button type="submit" disabled={!token || mismatch || mutation.isPending}>Set password</Button>
          </>
        )}
      </form>
    </main>
  );
}
