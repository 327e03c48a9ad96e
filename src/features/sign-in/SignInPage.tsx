import { useState, type FormEvent } from 'react';
import { Navigate, useLocation, useNavigate } from 'react-router-dom';
import { Button, ErrorState, Field, inputClass, Notice } from '../../components/ui.js';
import { ApiError } from '../../lib/api-client.js';
import { useSession } from '../../lib/session.js';
import { useRequestReset, useSignIn } from './api/sign-in.js';

export function SignInPage() {
  const session = useSession();
  const signIn = useSignIn();
  const reset = useRequestReset();
  const navigate = useNavigate();
  const location = useLocation();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [totp, setTotp] = useState('');
  const [mode, setMode] = useState<'sign-in' | 'forgot'>('sign-in');
  const needsTotp = signIn.error instanceof ApiError && signIn.error.code === 'totp_required';
  const expired = new URLSearchParams(location.search).get('expired');

  if (session.data) return <Navigate to="/" replace />;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (mode === 'forgot') return reset.mutate(email);
    signIn.mutate({ email, password, totp: totp || undefined }, { onSuccess: () => navigate('/', { replace: true }) });
  };

  return (
    <main className="flex min-h-screen items-center justify-center bg-surface p-4">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center">
          <p className="text-3xl font-bold tracking-tight text-accent">Alveolog</p>
          <p className="text-sm text-muted">Post-operative pulmonary complication registry</p>
        </div>
        <form onSubmit={submit} className="flex flex-col gap-4 rounded border border-line bg-panel p-5" aria-labelledby="sign-in-title">
          <h1 id="sign-in-title" className="text-lg font-semibold">{mode === 'forgot' ? 'Reset your password' : 'Sign in'}</h1>
          {expired && <Notice tone="warn">You were signed out after a period without activity. Sign in again.</Notice>}
          <Field label="E-mail" htmlFor="email">
            <input id="email" type="email" autoComplete="username" required className={inputClass} value={email} onChange={(e) => setEmail(e.target.value)} />
          </Field>
          {mode === 'sign-in' && (
            <Field label="Password" htmlFor="password">
              <input id="password" type="password" autoComplete="current-password" required className={inputClass} value={password} onChange={(e) => setPassword(e.target.value)} />
            </Field>
          )}
          {mode === 'sign-in' && needsTotp && (
            <Field label="Code from your authenticator app" htmlFor="totp">
              <input id="totp" inputMode="numeric" autoComplete="one-time-code" pattern="\d{6}" className={inputClass} value={totp} onChange={(e) => setTotp(e.target.value)} autoFocus />
            </Field>
          )}
          {mode === 'sign-in' && signIn.error && !needsTotp && <ErrorState error={signIn.error} />}
          {mode === 'forgot' && reset.isSuccess && <Notice tone="ok">If the address has an account, a reset link is on its way. It works once, for one hour.</Notice>}
          {mode === 'forgot' && reset.error && <ErrorState error={reset.error} />}
          <Button type="submit" disabled={signIn.isPending || reset.isPending}>{mode === 'forgot' ? 'Send reset link' : signIn.isPending ? 'Signing in…' : 'Sign in'}</Button>
          <Button type="button" variant="ghost" onClick={() => setMode(mode === 'forgot' ? 'sign-in' : 'forgot')}>
            {mode === 'forgot' ? 'Back to sign-in' : 'Forgot your password?'}
          </Button>
        </form>
        <p className="mt-4 text-center text-xs text-muted">For surveillance and quality improvement only. Never enter names, record numbers or addresses.</p>
      </div>
    </main>
  );
}
