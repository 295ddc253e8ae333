// The user's own account: unit system and password.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { ChangePasswordInput, MIN_PASSWORD_LENGTH } from '@/shared/schemas/auth';
import { ROLE_LABELS } from '@/shared/permissions';
import { api } from '@/lib/api-client';
import { authKeys, useMe, type Me } from '@/lib/auth';
import { clientFieldErrors, serverFieldErrors } from '@/lib/form-errors';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Card, PageHeader } from '@/components/ui/page';

export function AccountPage() {
  const { data: me } = useMe();
  const qc = useQueryClient();
  const [current, setCurrent] = useState('');
  const [next, setNext] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});

  const profile = useMutation({
    // null: follow the organisation's default, whatever an admin sets it to later.
    mutationFn: (unitSystem: 'metric' | 'imperial' | null) => api<Me>('/api/auth/me', { method: 'PATCH', body: { unitSystem } }),
    onSuccess: (m) => {
      qc.setQueryData(authKeys.me, m);
      showToast('Unit system saved', 'ok');
    },
  });
  const password = useMutation({
    mutationFn: () => api<void>('/api/auth/password', { method: 'POST', body: { currentPassword: current, newPassword: next } }),
    onSuccess: () => {
      setCurrent('');
      setNext('');
      setFields({});
      showToast('Password changed. Other devices have been signed out.', 'ok');
    },
    onError: (err) => setFields(serverFieldErrors(err)),
    meta: { inlineErrors: true },
  });

  if (!me) return null;

  function submit(e: FormEvent) {
    e.preventDefault();
    const errs = clientFieldErrors(ChangePasswordInput, { currentPassword: current, newPassword: next });
    setFields(errs ?? {});
    if (!errs) password.mutate();
  }

  return (
    <div className="max-w-xl">
      <PageHeader title="Your account" lead={`${me.user.name} · ${me.user.email} · ${me.user.roles.map((r) => ROLE_LABELS[r]).join(', ')}`} />
      <div className="space-y-6">
        <Card>
          <h2 className="mb-3 text-lg font-semibold">Units</h2>
          <SelectField
            label="Show units first in"
            value={me.user.unitSystemSource === 'own' ? me.user.unitSystem : 'organisation'}
            onChange={(e) => profile.mutate(e.target.value === 'organisation' ? null : (e.target.value as 'metric' | 'imperial'))}
            disabled={profile.isPending}
            hint="Values can be typed in either system wherever you enter them."
          >
            <option value="organisation">Organisation default ({me.user.organisationUnitSystem === 'imperial' ? 'US customary' : 'metric'})</option>
            <option value="metric">Metric (bar, mm, °C)</option>
            <option value="imperial">US customary (psi, in, °F)</option>
          </SelectField>
        </Card>
        <Card>
          <form onSubmit={submit} noValidate className="space-y-4">
            <h2 className="text-lg font-semibold">Change password</h2>
            <TextField label="Current password" type="password" autoComplete="current-password" value={current} onChange={(e) => setCurrent(e.target.value)} error={fields.currentPassword} />
            <TextField
              label="New password"
              type="password"
              autoComplete="new-password"
              value={next}
              onChange={(e) => setNext(e.target.value)}
              error={fields.newPassword}
              hint={`At least ${MIN_PASSWORD_LENGTH} characters; common passwords are refused.`}
            />
            <Button type="submit" busy={password.isPending}>
              Change password
            </Button>
          </form>
        </Card>
      </div>
    </div>
  );
}
