// Forgotten password: ask for a link by e-mail, then (arriving from the link) choose a new password.
// The first step answers the same whether or not the address has an account.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router';
import { MIN_PASSWORD_LENGTH } from '@/shared/schemas/auth';
import { ResetConfirmInput, ResetRequestInput } from '@/shared/schemas/cases';
import { api, errorMessage } from '@/lib/api-client';
import { authKeys, type Me } from '@/lib/auth';
import { clientFieldErrors, serverFieldErrors } from '@/lib/form-errors';
import { paths } from '@/lib/paths';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice, Toaster } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { Wordmark } from '@/components/ui/icons';

function AskForLink() {
  const [email, setEmail] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});
  const ask = useMutation({
    mutationFn: () => api<{ message: string }>('/api/auth/password-reset', { method: 'POST', body: { email } }),
    onError: (err) => setFields(serverFieldErrors(err)),
    meta: { inlineErrors: true },
  });

  function submit(e: FormEvent) {
    e.preventDefault();
    const errs = clientFieldErrors(ResetRequestInput, { email });
    setFields(errs ?? {});
    if (!errs) ask.mutate();
  }

  if (ask.isSuccess) {
    return (
      <div className="space-y-4 rounded-lg border border-rule bg-paper-raised p-5">
        <h1 className="text-xl font-semibold">Check your e-mail</h1>
        <Notice tone="ok">{ask.data.message}</Notice>
        <p className="text-sm text-ink-soft">Nothing after a few minutes? Look in the spam folder, or ask your Beadpath admin.</p>
        <Link to={paths.signIn} className="inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
          Back to sign in
        </Link>
      </div>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-4 rounded-lg border border-rule bg-paper-raised p-5">
      <h1 className="text-xl font-semibold">Forgot your password?</h1>
      <p className="text-ink-soft">Enter the e-mail you sign in with. We send a link to choose a new password; it works once, for an hour.</p>
      {ask.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(ask.error)} /> : null}
      <TextField label="E-mail" type="email" autoComplete="username" inputMode="email" value={email} onChange={(e) => setEmail(e.target.value)} error={fields.email} />
      <Button type="submit" className="w-full" busy={ask.isPending}>
        Send me a link
      </Button>
      <Link to={paths.signIn} className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
        Back to sign in
      </Link>
    </form>
  );
}

function ChooseNewPassword({ token }: { token: string }) {
  const navigate = useNavigate();
  const qc = useQueryClient();
  const info = useQuery({
    queryKey: ['auth', 'reset', token],
    queryFn: () => api<{ name: string; email: string; organisationName: string }>(`/api/auth/password-reset/${encodeURIComponent(token)}`),
    meta: { quiet: true },
    retry: false,
  });
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});
  const confirm = useMutation({
    mutationFn: () => api<Me>('/api/auth/password-reset/confirm', { method: 'POST', body: { token, password } }),
    onSuccess: (me) => {
      qc.clear();
      qc.setQueryData(authKeys.me, me);
      navigate('/', { replace: true });
    },
    onError: (err) => setFields(serverFieldErrors(err)),
    meta: { inlineErrors: true },
  });

  function submit(e: FormEvent) {
    e.preventDefault();
    const errs = clientFieldErrors(ResetConfirmInput, { token, password }) ?? {};
    if (password !== repeat) errs.repeat = 'The two passwords differ';
    setFields(errs);
    if (Object.keys(errs).length === 0) confirm.mutate();
  }

  if (info.isPending) return <LoadingBlock />;
  if (info.isError) {
    return (
      <div className="space-y-4">
        <Notice tone="error" title="This link cannot be used">
          {errorMessage(info.error)}
        </Notice>
        <Link to={paths.resetPassword} className="inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
          Ask for a new link
        </Link>
      </div>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-4 rounded-lg border border-rule bg-paper-raised p-5">
      <h1 className="text-xl font-semibold">Choose a new password</h1>
      <p className="text-ink-soft">
        For {info.data.email} at {info.data.organisationName}. You are signed out everywhere else.
      </p>
      {confirm.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(confirm.error)} /> : null}
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        error={fields.password ?? fields.token}
        hint={`At least ${MIN_PASSWORD_LENGTH} characters. A short sentence works well.`}
      />
      <TextField label="Repeat the password" type="password" autoComplete="new-password" value={repeat} onChange={(e) => setRepeat(e.target.value)} error={fields.repeat} />
      <Button type="submit" className="w-full" busy={confirm.isPending}>
        Save and sign in
      </Button>
    </form>
  );
}

export function ResetPasswordPage() {
  const [params] = useSearchParams();
  const token = params.get('token');
  return (
    <div className="flex min-h-dvh flex-col items-center justify-center bg-paper px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center">
          <Wordmark className="text-3xl" />
        </div>
        {token ? <ChooseNewPassword token={token} /> : <AskForLink />}
      </div>
      <Toaster />
    </div>
  );
}
