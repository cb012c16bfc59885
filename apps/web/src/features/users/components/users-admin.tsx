import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { inviteUserSchema, type InviteUser, type UserSummary } from '@turnstone/contracts/users';
import { roleLabels, roles, type Role } from '@turnstone/contracts/roles';
import { Button } from '../../../components/ui/button.tsx';
import { TableHead } from '../../../components/ui/table-head.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import {
  InputField,
  Select,
  SelectField,
  type SelectOption,
} from '../../../components/ui/field.tsx';
import { formField } from '../../../lib/form-field.ts';
import { toggled } from '../../../lib/toggled.ts';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { fieldErrorsOf } from '../../../lib/api-client.ts';
import { useUsers } from '../api/get-users.ts';
import { useInviteUser, useSetUserDisabled, useUpdateUser } from '../api/change-user.ts';

type Site = { id: number; code: string; name: string };

const roleOptions = roles.map((r): SelectOption => [r, roleLabels[r]]);

function SiteChecks({
  sites,
  value,
  onChange,
  legend,
}: {
  sites: Site[];
  value: number[];
  onChange: (v: number[]) => void;
  legend: string;
}) {
  return (
    <fieldset className="flex flex-wrap gap-x-4 gap-y-1">
      <legend className="sr-only">{legend}</legend>
      {sites.map((s) => (
        <label key={s.id} className="flex items-center gap-1.5 text-sm">
          <input
            type="checkbox"
            checked={value.includes(s.id)}
            onChange={(e) => onChange(toggled(value, s.id, e.target.checked))}
          />
          <span className="font-mono text-xs">{s.code}</span>
          <span className="text-ink-muted">{s.name}</span>
        </label>
      ))}
    </fieldset>
  );
}

/** Account state as shape + text: filled circle active, hollow circle invited, bar disabled. */
function UserState({ user }: { user: UserSummary }) {
  const [label, shape, colour] = user.disabledAt
    ? [
        'Disabled',
        <rect key="d" x="1.5" y="4.5" width="9" height="3" rx="1.5" fill="currentColor" />,
        'text-status-danger',
      ]
    : user.invitePending
      ? [
          'Invited',
          <circle
            key="i"
            cx="6"
            cy="6"
            r="4.2"
            fill="none"
            stroke="currentColor"
            strokeWidth="1.5"
          />,
          'text-status-alert',
        ]
      : ['Active', <circle key="a" cx="6" cy="6" r="4.5" fill="currentColor" />, 'text-status-ok'];
  return (
    <span className={`inline-flex items-center gap-1.5 text-sm ${colour}`}>
      <svg viewBox="0 0 12 12" aria-hidden="true" className="size-3">
        {shape}
      </svg>
      <span className="text-ink">{label}</span>
    </span>
  );
}

function InviteForm({ sites }: { sites: Site[] }) {
  const invite = useInviteUser();
  const [sent, setSent] = useState<string | null>(null);
  const form = useForm<InviteUser>({
    resolver: zodResolver(inviteUserSchema),
    defaultValues: { email: '', name: '', role: 'operator', siteIds: [] },
  });
  const { errors } = form.formState;
  const siteIds = useWatch({ control: form.control, name: 'siteIds' });
  const onSubmit = form.handleSubmit((values) =>
    invite.mutate(values, {
      onSuccess: (u) => {
        setSent(u.email);
        form.reset();
      },
      onError: (error) => {
        for (const [k, m] of Object.entries(fieldErrorsOf(error)))
          form.setError(k as keyof InviteUser, { message: m });
      },
    }),
  );
  return (
    <Card className="p-4">
      <h2 className="text-sm font-semibold">Invite a user</h2>
      <p className="mt-0.5 text-sm text-ink-muted">
        They get an e-mail with a link to choose a password; it works once, for 72 hours.
      </p>
      <form onSubmit={onSubmit} noValidate className="mt-3 grid gap-3 sm:grid-cols-2">
        <InputField label="E-mail" type="email" autoComplete="off" {...formField(form, 'email')} />
        <InputField label="Name" autoComplete="off" {...formField(form, 'name')} />
        <SelectField label="Role" options={roleOptions} {...formField(form, 'role')} />
        <div className="flex flex-col gap-1.5">
          <span className="text-sm font-medium">Sites</span>
          <SiteChecks
            legend="Sites of the new user"
            sites={sites}
            value={siteIds}
            onChange={(v) => form.setValue('siteIds', v)}
          />
          {errors.siteIds?.message && (
            <p className="text-xs font-medium text-status-danger">{errors.siteIds.message}</p>
          )}
        </div>
        <div className="flex items-center gap-3 sm:col-span-2">
          <Button type="submit" variant="primary" busy={invite.isPending}>
            Send invite
          </Button>
          {sent && !invite.isError && (
            <p role="status" className="text-sm text-ink-muted">
              Invite sent to <span className="font-mono">{sent}</span>.
            </p>
          )}
          {invite.isError && Object.keys(fieldErrorsOf(invite.error)).length === 0 && (
            <p role="alert" className="text-sm text-status-danger">
              {invite.error.message}
            </p>
          )}
        </div>
      </form>
    </Card>
  );
}

function UserRow({ user, sites, meId }: { user: UserSummary; sites: Site[]; meId: number }) {
  const [editing, setEditing] = useState(false);
  const [role, setRole] = useState<Role>(user.role);
  const [siteIds, setSiteIds] = useState(user.siteIds);
  const update = useUpdateUser();
  const toggle = useSetUserDisabled();
  const codes = sites.filter((s) => user.siteIds.includes(s.id)).map((s) => s.code);
  return (
    <tr className="border-t border-line align-top">
      <td className="px-3 py-2">
        <div className="font-medium">{user.name}</div>
        <div className="font-mono text-xs text-ink-muted">{user.email}</div>
      </td>
      <td className="px-3 py-2">
        {editing ? (
          <Select
            aria-label={`Role of ${user.name}`}
            value={role}
            onChange={(e) => setRole(e.target.value as Role)}
            disabled={user.id === meId}
          >
            {roles.map((r) => (
              <option key={r} value={r}>
                {roleLabels[r]}
              </option>
            ))}
          </Select>
        ) : (
          roleLabels[user.role]
        )}
      </td>
      <td className="px-3 py-2">
        {editing ? (
          <SiteChecks
            legend={`Sites of ${user.name}`}
            sites={sites}
            value={siteIds}
            onChange={setSiteIds}
          />
        ) : user.role === 'admin' ? (
          <span className="text-ink-muted">all sites</span>
        ) : (
          <span className="font-mono text-xs">{codes.join(', ') || '—'}</span>
        )}
      </td>
      <td className="px-3 py-2">
        <UserState user={user} />
      </td>
      <td className="px-3 py-2">
        <div className="flex flex-wrap justify-end gap-2">
          {editing ? (
            <>
              <Button
                size="sm"
                variant="primary"
                busy={update.isPending}
                onClick={() =>
                  update.mutate(
                    { id: user.id, role, siteIds },
                    { onSuccess: () => setEditing(false) },
                  )
                }
              >
                Save
              </Button>
              <Button size="sm" variant="ghost" onClick={() => setEditing(false)}>
                Cancel
              </Button>
            </>
          ) : (
            <Button size="sm" onClick={() => setEditing(true)} aria-label={`Edit ${user.name}`}>
              Edit
            </Button>
          )}
          {user.id !== meId && (
            <Button
              size="sm"
              variant="ghost"
              busy={toggle.isPending}
              onClick={() => toggle.mutate({ id: user.id, disabled: !user.disabledAt })}
              aria-label={`${user.disabledAt ? 'Enable' : 'Disable'} ${user.name}`}
            >
              {user.disabledAt ? 'Enable' : 'Disable'}
            </Button>
          )}
        </div>
        {(update.isError || toggle.isError) && (
          <p role="alert" className="mt-1 text-right text-xs text-status-danger">
            {(update.error ?? toggle.error)?.message}
          </p>
        )}
      </td>
    </tr>
  );
}

export function UsersAdmin({ meId }: { meId: number }) {
  const users = useUsers();
  if (users.isPending) return <LoadingPanel />;
  if (users.isError)
    return (
      <Card>
        <ErrorState error={users.error} onRetry={() => void users.refetch()} />
      </Card>
    );
  const { items, sites } = users.data;
  return (
    <div className="flex flex-col gap-4">
      <InviteForm sites={sites} />
      <Card className="overflow-x-auto">
        {items.length === 0 ? (
          <EmptyState title="No users" />
        ) : (
          <table className="w-full text-sm">
            <TableHead
              columns={['User', 'Role', 'Sites', 'State']}
              actions={{ label: 'Actions', visible: true }}
            />
            <tbody>
              {items.map((u) => (
                <UserRow
                  key={`${u.id}-${u.role}-${u.siteIds.join()}`}
                  user={u}
                  sites={sites}
                  meId={meId}
                />
              ))}
            </tbody>
          </table>
        )}
      </Card>
    </div>
  );
}
