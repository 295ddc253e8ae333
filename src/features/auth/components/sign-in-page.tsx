// Public sign-in page: e-mail and password, the error in words, back to where the user was going.
import { useState, type FormEvent } from 'react';
import { Link, Navigate, useNavigate, useSearchParams } from 'react-router';
import { LoginInput } from '@/shared/schemas/auth';
import { errorMessage } from '@/lib/api-client';
import { useLogin, useMe } from '@/lib/auth';
import { clientFieldErrors, serverFieldErrors } from '@/lib/form-errors';
import { paths } from '@/lib/paths';
import { Button } from '@/components/ui/button';
import { Notice, Toaster } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { Wordmark } from '@/components/ui/icons';

function safeNext(next: string | null): string {
  return next && next.startsWith('/') && !next.startsWith('//') ? next : '/';
}

export function SignInPage() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const { data: me } = useMe();
  const login = useLogin();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});

  if (me) return <Navigate to={safeNext(params.get('next'))} replace />;

  function submit(e: FormEvent) {
    e.preventDefault();
    const errs = clientFieldErrors(LoginInput, { email, password });
    setFields(errs ?? {});
    if (errs) return;
    login.mutate(
      { email, password },
      {
        onSuccess: () => navigate(safeNext(params.get('next')), { replace: true }),
        onError: (err) => setFields(serverFieldErrors(err)),
      },
    );
  }

  return (
    <div className="flex min-h-dvh flex-col items-center justify-center bg-paper px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center">
          <Wordmark className="text-3xl" />
          <p className="mt-2 text-ink-soft">Find the cause, fix it safely, keep the record.</p>
        </div>
        <form onSubmit={submit} noValidate className="space-y-4 rounded-lg border border-rule bg-paper-raised p-5 shadow-sm">
          <h1 className="text-xl font-semibold">Sign in</h1>
          {login.isError ? <Notice tone="error" title={errorMessage(login.error)} /> : null}
          <TextField label="E-mail" type="email" autoComplete="username" inputMode="email" value={email} onChange={(e) => setEmail(e.target.value)} error={fields.email} required />
          <TextField label="Password" type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.target.value)} error={fields.password} required />
          <Button type="submit" className="w-full" busy={login.isPending}>
            Sign in
          </Button>
          <Link to={paths.resetPassword} className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
            Forgot your password?
          </Link>
        </form>
        <p className="mt-4 text-center text-sm text-ink-soft">No account yet? Ask your Beadpath admin for an invitation.</p>
      </div>
      <Toaster />
    </div>
  );
}
