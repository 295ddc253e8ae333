// Accepting an invitation: the invited person sets a password and is signed in.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { useNavigate, useParams } from 'react-router';
import { AcceptInviteInput, MIN_PASSWORD_LENGTH } from '@/shared/schemas/auth';
import { api, errorMessage } from '@/lib/api-client';
import { authKeys, type Me } from '@/lib/auth';
import { clientFieldErrors, serverFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice, Toaster } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { Wordmark } from '@/components/ui/icons';

export function InvitePage() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  const qc = useQueryClient();
  const info = useQuery({
    queryKey: ['auth', 'invite', token],
    queryFn: () => api<{ name: string; email: string; organisationName: string }>(`/api/auth/invite/${encodeURIComponent(token)}`),
    meta: { quiet: true },
    retry: false,
  });
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});
  const accept = useMutation({
    mutationFn: () => api<Me>('/api/auth/invite/accept', { method: 'POST', body: { token, password } }),
    onSuccess: (me) => {
      qc.setQueryData(authKeys.me, me);
      navigate('/', { replace: true });
    },
    onError: (err) => setFields(serverFieldErrors(err)),
    meta: { inlineErrors: true },
  });

  function submit(e: FormEvent) {
    e.preventDefault();
    const errs = clientFieldErrors(AcceptInviteInput, { token, password }) ?? {};
    if (password !== repeat) errs.repeat = 'The two passwords differ';
    setFields(errs);
    if (Object.keys(errs).length === 0) accept.mutate();
  }

  return (
    <div className="flex min-h-dvh flex-col items-center justify-center px-4 py-10">
      <div className="w-full max-w-sm">
        <div className="mb-6 text-center">
          <Wordmark className="text-3xl" />
        </div>
        {info.isPending ? (
          <LoadingBlock />
        ) : info.isError ? (
          <Notice tone="error" title="This invitation cannot be used">
            {errorMessage(info.error)}. Ask your admin to send a new one.
          </Notice>
        ) : (
          <form onSubmit={submit} noValidate className="space-y-4 rounded-lg border border-rule bg-paper-raised p-5">
            <h1 className="text-xl font-semibold">Welcome, {info.data.name}</h1>
            <p className="text-ink-soft">
              Set a password for {info.data.email} to join {info.data.organisationName}.
            </p>
            {accept.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(accept.error)} /> : null}
            <TextField
              label="New password"
              type="password"
              autoComplete="new-password"
              value={password}
              onChange={(e) => setPassword(e.target.value)}
              error={fields.password}
              hint={`At least ${MIN_PASSWORD_LENGTH} characters. A short sentence works well.`}
            />
            <TextField label="Repeat the password" type="password" autoComplete="new-password" value={repeat} onChange={(e) => setRepeat(e.target.value)} error={fields.repeat} />
            <Button type="submit" className="w-full" busy={accept.isPending}>
              Set password and sign in
            </Button>
          </form>
        )}
      </div>
      <Toaster />
    </div>
  );
}
