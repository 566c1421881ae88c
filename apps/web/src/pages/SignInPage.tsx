import { useState, type FormEvent } from 'react';
import { Button, Callout } from '@blueprintjs/core';
import { useMutation } from '@tanstack/react-query';
import { Link, Navigate, useLocation, useNavigate } from 'react-router-dom';
import { describeError } from '../api/client';
import { useAuth } from '../auth/AuthProvider';
import { Wordmark } from '../components/Wordmark';
import { AccountField, AccountFormProblem } from '../components/AccountField';

interface FromState {
  from?: string;
  /** Set by the set-password page: the address to sign in with, and what just happened. */
  email?: string;
  notice?: string;
}

function destination(state: unknown): string {
  const from = (state as FromState | null)?.from;
  // Only in-app paths; never bounce back to the sign-in page itself.
  return typeof from === 'string' && from.startsWith('/') && !from.startsWith('/sign-in') ? from : '/publications';
}

export function SignInPage() {
  const { user, signIn, lastSignOut } = useAuth();
  const navigate = useNavigate();
  const location = useLocation();
  const arrived = (location.state as FromState | null) ?? {};
  const [email, setEmail] = useState(typeof arrived.email === 'string' ? arrived.email : '');
  const [password, setPassword] = useState('');
  const [fieldError, setFieldError] = useState<string | null>(null);

  const login = useMutation({
    mutationFn: signIn,
    onSuccess: () => navigate(destination(location.state), { replace: true }),
  });

  if (user && !login.isPending) return <Navigate to={destination(location.state)} replace />;

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    if (login.isPending) return;
    const trimmed = email.trim();
    if (!trimmed) return setFieldError('Enter your email address.');
    if (!password) return setFieldError('Enter your password.');
    setFieldError(null);
    login.mutate({ email: trimmed, password });
  }

  const error = fieldError ?? (login.isError ? describeError(login.error) : null);
  const pending = login.isPending;

  return (
    <main className="pf-signin">
      <form className="pf-signin-card" onSubmit={submit} noValidate aria-labelledby="signin-title" data-testid="signin-form">
        <Wordmark large />
        <h1 id="signin-title" className="pf-signin-title">
          Sign in
        </h1>
        <p className="pf-muted">Orbital figures for print and screen, from composition to approved proof.</p>

        {typeof arrived.notice === 'string' && !error && (
          <Callout intent="success" compact className="pf-gap" data-testid="signin-arrived">
            {arrived.notice}
          </Callout>
        )}
        {lastSignOut === 'expired' && !error && (
          <Callout intent="warning" compact className="pf-gap" data-testid="signin-notice">
            Your session has ended. Sign in again to continue.
          </Callout>
        )}
        {error && (
          <AccountFormProblem testId="signin-error" className="pf-gap">
            {error}
          </AccountFormProblem>
        )}

        <AccountField id="signin-email" name="email" label="Email" type="email" autoComplete="username" autoFocus value={email} onChange={setEmail} disabled={pending} testId="signin-email" />
        <AccountField id="signin-password" name="password" label="Password" type="password" autoComplete="current-password" value={password} onChange={setPassword} disabled={pending} testId="signin-password" />
        <Button
          type="submit"
          intent="primary"
          fill
          size="large"
          loading={pending}
          disabled={pending}
          text="Sign in"
          data-testid="signin-submit"
        />
        <p className="pf-gap pf-small">
          <Link to="/forgot-password" data-testid="signin-forgot">
            Forgot your password?
          </Link>
        </p>
      </form>
    </main>
  );
}
