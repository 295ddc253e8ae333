// Admin: the organisation's people, their roles, invitations and deactivation.
import { useState, type FormEvent } from 'react';
import { ROLES, ROLE_LABELS, type Role } from '@/shared/permissions';
import { InviteUserInput } from '@/shared/schemas/auth';
import { useMe } from '@/lib/auth';
import { clientFieldErrors, serverFieldErrors } from '@/lib/form-errors';
import { showToast } from '@/lib/toasts';
import { paths } from '@/lib/paths';
import { Button } from '@/components/ui/button';
import { EmptyState, ListSkeleton, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { Card, PageHeader } from '@/components/ui/page';
import { useInviteUser, useReissueInvite, useUpdateUser, useUsers, type AdminUser } from '../api/users';
import { formatDate } from '@/lib/format';

function RolePicker({ value, onChange, legend, error }: { value: Role[]; onChange: (r: Role[]) => void; legend: string; error?: string }) {
  return (
    <fieldset>
      <legend className="mb-1 text-sm font-semibold">{legend}</legend>
      <div className="flex flex-wrap gap-2">
        {ROLES.map((r) => {
          const on = value.includes(r);
          return (
            <label key={r} className={`flex min-h-11 cursor-pointer items-center gap-2 rounded-md border px-3 ${on ? 'border-amber bg-amber-wash' : 'border-rule-strong bg-paper-raised'}`}>
              <input type="checkbox" className="size-5 accent-[#9C5700]" checked={on} onChange={() => onChange(on ? value.filter((x) => x !== r) : [...value, r])} />
              {ROLE_LABELS[r]}
            </label>
          );
        })}
      </div>
      {error ? <p className="mt-1 text-sm font-semibold text-danger">{error}</p> : null}
    </fieldset>
  );
}

function inviteLink(token: string) {
  return `${window.location.origin}${paths.invite(token)}`;
}

function InviteLinkNotice({ name, token, email }: { name: string; token: string; email?: string }) {
  const link = inviteLink(token);
  return (
    <Notice tone="ok" title={email ? `Invitation e-mailed to ${name}` : `Invitation for ${name} is ready`}>
      <p>{email ? `Beadpath sent the link to ${email}; it works once, for 7 days. If it does not arrive, send them this copy:` : 'Send this link to them; it works once, for 7 days.'}</p>
      <div className="mt-2 flex flex-wrap items-center gap-2">
        <code className="break-all rounded bg-paper-raised px-2 py-1 text-ink" data-testid="invite-link">
          {link}
        </code>
        <Button variant="secondary" onClick={() => navigator.clipboard?.writeText(link).then(() => showToast('Link copied', 'ok'))}>
          Copy link
        </Button>
      </div>
    </Notice>
  );
}

function InviteForm() {
  const invite = useInviteUser();
  const [name, setName] = useState('');
  const [email, setEmail] = useState('');
  const [roles, setRoles] = useState<Role[]>(['technician']);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [created, setCreated] = useState<{ name: string; token: string; email?: string } | null>(null);

  function submit(e: FormEvent) {
    e.preventDefault();
    const errs = clientFieldErrors(InviteUserInput, { name, email, roles });
    setFields(errs ?? {});
    if (errs) return;
    invite.mutate(
      { name, email, roles },
      {
        onSuccess: (out) => {
          setCreated({ name: out.user.name, token: out.inviteToken, email: (out as { emailed?: boolean }).emailed ? out.user.email : undefined });
          setName('');
          setEmail('');
        },
        onError: (err) => setFields(serverFieldErrors(err)),
      },
    );
  }

  return (
    <Card>
      <form onSubmit={submit} noValidate className="space-y-4">
        <h2 className="text-lg font-semibold">Invite someone</h2>
        {created ? <InviteLinkNotice name={created.name} token={created.token} email={created.email} /> : null}
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={fields.name} autoComplete="off" />
          <TextField label="E-mail" type="email" value={email} onChange={(e) => setEmail(e.target.value)} error={fields.email} autoComplete="off" />
        </div>
        <RolePicker legend="Roles" value={roles} onChange={setRoles} error={fields.roles} />
        <Button type="submit" busy={invite.isPending}>
          Invite by e-mail
        </Button>
      </form>
    </Card>
  );
}

function UserRow({ user, isSelf }: { user: AdminUser; isSelf: boolean }) {
  const update = useUpdateUser();
  const reissue = useReissueInvite();
  const [editing, setEditing] = useState(false);
  const [roles, setRoles] = useState<Role[]>(user.roles);
  const [link, setLink] = useState<{ token: string; emailed: boolean } | null>(null);

  return (
    <li className={`rounded-lg border border-rule bg-paper-raised p-4 ${user.active ? '' : 'opacity-75'}`} data-testid={`user-${user.email}`}>
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <p className="font-semibold">
            {user.name} {isSelf ? <span className="text-sm font-normal text-ink-soft">(you)</span> : null}
          </p>
          <p className="break-all text-sm text-ink-soft">{user.email}</p>
          <p className="mt-1 text-sm">
            {user.roles.map((r) => ROLE_LABELS[r]).join(', ')} ·{' '}
            {!user.active ? (
              <span className="font-semibold text-danger">Deactivated</span>
            ) : user.invitePending ? (
              <span className="font-semibold text-amber-deep">Invitation pending</span>
            ) : user.lastSignInAt ? (
              `Last signed in ${formatDate(user.lastSignInAt)}`
            ) : (
              'Never signed in'
            )}
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          <Button variant="secondary" onClick={() => setEditing((v) => !v)} aria-expanded={editing}>
            {editing ? 'Close' : 'Change roles'}
          </Button>
          {user.invitePending && user.active ? (
            <Button
              variant="secondary"
              busy={reissue.isPending}
              onClick={() => reissue.mutate(user.id, { onSuccess: (o) => setLink({ token: o.inviteToken, emailed: Boolean((o as { emailed?: boolean }).emailed) }) })}
            >
              New invitation link
            </Button>
          ) : null}
          {!isSelf ? (
            <Button
              variant={user.active ? 'danger' : 'secondary'}
              busy={update.isPending && update.variables?.active !== undefined}
              onClick={() => {
                if (user.active && !window.confirm(`Deactivate ${user.name}? They are signed out at once.`)) return;
                update.mutate({ id: user.id, active: !user.active }, { onSuccess: () => showToast(user.active ? `${user.name} deactivated` : `${user.name} reactivated`, 'ok') });
              }}
            >
              {user.active ? 'Deactivate' : 'Reactivate'}
            </Button>
          ) : null}
        </div>
      </div>
      {link ? (
        <div className="mt-3">
          <InviteLinkNotice name={user.name} token={link.token} email={link.emailed ? user.email : undefined} />
        </div>
      ) : null}
      {editing ? (
        <div className="mt-4 space-y-3 border-t border-rule pt-4">
          <RolePicker legend={`Roles of ${user.name}`} value={roles} onChange={setRoles} />
          <Button
            busy={update.isPending}
            disabled={roles.length === 0}
            onClick={() =>
              update.mutate(
                { id: user.id, roles },
                {
                  onSuccess: () => {
                    setEditing(false);
                    showToast('Roles saved', 'ok');
                  },
                },
              )
            }
          >
            Save roles
          </Button>
        </div>
      ) : null}
    </li>
  );
}

export function UsersPage() {
  const { data: me } = useMe();
  const users = useUsers();
  return (
    <div>
      <PageHeader title="Users" lead="Invite people, give them roles, and deactivate accounts that should no longer sign in." />
      <div className="grid gap-6 lg:grid-cols-[1fr_24rem]">
        <div>
          {users.isPending ? (
            <ListSkeleton label="Loading users" />
          ) : users.isError ? (
            <Notice tone="error" title="Users could not be loaded">
              Reload the page to try again.
            </Notice>
          ) : users.data.length === 0 ? (
            <EmptyState title="No users yet">Invite the first person with the form.</EmptyState>
          ) : (
            <ul className="space-y-3">
              {users.data.map((u) => (
                <UserRow key={u.id} user={u} isSelf={u.id === me?.user.id} />
              ))}
            </ul>
          )}
        </div>
        <InviteForm />
      </div>
    </div>
  );
}
