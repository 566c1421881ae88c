import { useState, type FormEvent } from 'react';
import { Button, Callout, NonIdealState, Spinner } from '@blueprintjs/core';
import { useMutation, useQuery } from '@tanstack/react-query';
import { Link, useLocation, useNavigate } from 'react-router-dom';
import { MIN_PASSWORD_LENGTH } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { Wordmark } from '../components/Wordmark';
import { AccountField, AccountFormProblem } from '../components/AccountField';
import { linkInfo, requestPasswordReset as requestReset, setPassword } from '../admin/adminApi';

/** The token travels in the fragment (#token=…): browsers never send it to a server. */
export function tokenFromHash(hash: string): string {
  return new URLSearchParams(hash.replace(/^#/, '')).get('token') ?? '';
}

/** Passwords: 10 to 72 characters (the server's rule; bcrypt reads 72 bytes). */
export function passwordProblem(pw: string, again: string): string | null {
  if (pw.length < MIN_PASSWORD_LENGTH) return `Use at least ${MIN_PASSWORD_LENGTH} characters.`;
  if (new TextEncoder().encode(pw).length > 72) return 'Use at most 72 characters.';
  if (pw !== again) return 'The two passwords differ.';
  return null;
}

/** Where an invitation or reset link lands: choose a password, then sign in. */
export function SetPasswordPage() {
  const api = useApi();
  const location = useLocation();
  const navigate = useNavigate();
  const token = tokenFromHash(location.hash);
  const [pw, setPw] = useState('');
  const [again, setAgain] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const info = useQuery({ queryKey: ['link', token], queryFn: () => linkInfo(api, token), enabled: token.length > 0, retry: false, staleTime: Infinity });
  const save = useMutation({
    mutationFn: () => setPassword(api, token, pw),
    onSuccess: (r) => navigate('/sign-in', { replace: true, state: { email: r.email, notice: 'Your password is set. Sign in with it now.' } }),
  });

  function submit(e: FormEvent) {
    e.preventDefault();
    const p = passwordProblem(pw, again);
    setProblem(p);
    if (!p) save.mutate();
  }

  const bad = !token || info.isError;
  return (
    <main className="pf-signin">
      <form className="pf-signin-card" onSubmit={submit} noValidate data-testid="set-password-form">
        <Wordmark large />
        {info.isPending && token && <NonIdealState icon={<Spinner size={24} />} title="Checking your link…" />}
        {bad && (
          <Callout intent="warning" title="This link cannot be used" data-testid="set-password-bad-link">
            <p>{info.isError ? describeError(info.error) : 'The link is incomplete.'} Links work once and expire; ask your administrator for a new invitation, or ask for a new reset link.</p>
            <Link to="/forgot-password">Ask for a new reset link</Link> · <Link to="/sign-in">Sign in</Link>
          </Callout>
        )}
        {info.isSuccess && (
          <>
            <h1 className="pf-signin-title">{info.data.purpose === 'invite' ? `Welcome, ${info.data.displayName}` : 'Choose a new password'}</h1>
            <p className="pf-muted" data-testid="set-password-for">
              For <strong>{info.data.email}</strong>. At least {MIN_PASSWORD_LENGTH} characters.
            </p>
            {(problem || save.isError) && (
              <AccountFormProblem testId="set-password-error">{problem ?? describeError(save.error)}</AccountFormProblem>
            )}
            <AccountField id="sp-password" label="New password" type="password" autoComplete="new-password" value={pw} onChange={setPw} testId="set-password-password" />
            <AccountField id="sp-again" label="The same again" type="password" autoComplete="new-password" value={again} onChange={setAgain} testId="set-password-again" />
            <Button type="submit" intent="primary" fill size="large" text="Set password" loading={save.isPending} data-testid="set-password-submit" />
          </>
        )}
      </form>
    </main>
  );
}

/** "Forgot your password?": always the same answer, so it tells nobody which addresses have accounts. */
export function ForgotPasswordPage() {
  const api = useApi();
  const [email, setEmail] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const ask = useMutation({ mutationFn: () => requestReset(api, email.trim()) });
  function submit(e: FormEvent) {
    e.preventDefault();
    if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email.trim())) return setProblem('Enter the e-mail address you sign in with.');
    setProblem(null);
    ask.mutate();
  }
  return (
    <main className="pf-signin">
      <form className="pf-signin-card" onSubmit={submit} noValidate data-testid="forgot-form">
        <Wordmark large />
        <h1 className="pf-signin-title">Forgot your password?</h1>
        <p className="pf-muted">We send a link to choose a new one. It works once, for two hours.</p>
        {ask.isSuccess ? (
          <Callout intent="success" data-testid="forgot-done">
            {ask.data.message[0].toUpperCase() + ask.data.message.slice(1)}.
          </Callout>
        ) : (
          <>
            {(problem || ask.isError) && (
              <AccountFormProblem testId="forgot-error">{problem ?? describeError(ask.error)}</AccountFormProblem>
            )}
            <AccountField id="forgot-email" label="Email" type="email" autoComplete="username" value={email} onChange={setEmail} testId="forgot-email" />
            <Button type="submit" intent="primary" fill text="Send the link" loading={ask.isPending} data-testid="forgot-submit" />
          </>
        )}
        <p className="pf-gap">
          <Link to="/sign-in">Back to sign in</Link>
        </p>
      </form>
    </main>
  );
}
