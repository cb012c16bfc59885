import { roleLabels, roles, type Role } from '@turnstone/contracts/roles';
import type { ApiToken } from '@turnstone/contracts/api-tokens';
import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { FormCard } from '../../../components/ui/form-card.tsx';
import { InputField, SelectField, type SelectOption } from '../../../components/ui/field.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { QueryTable } from '../../../components/ui/query-table.tsx';
import { useNow } from '../../../hooks/use-now.ts';
import { useSaveErrors } from '../../../hooks/use-save-errors.ts';
import { toggled } from '../../../lib/toggled.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { Age } from '../../../components/ui/age.tsx';
import { useSites } from '../../gateways/api/get-gateways.ts';
import { useIssueApiToken, useRevokeApiToken } from '../api/change-integrations.ts';
import { useApiTokens } from '../api/get-integrations.ts';
import { SecretOnceDialog } from '../../../components/ui/secret-once-dialog.tsx';

const roleOptions = roles.map((r): SelectOption => [r, roleLabels[r]]);

function IssueTokenForm({ onIssued }: { onIssued: (token: string) => void }) {
  const sites = useSites();
  const issue = useIssueApiToken();
  const [name, setName] = useState('');
  const [role, setRole] = useState<Role>('planner');
  const [siteIds, setSiteIds] = useState<number[]>([]);
  const { errors, formError, save } = useSaveErrors();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save(issue.mutateAsync({ name, role, siteIds }), (issued) => {
      onIssued(issued.token);
      setName('');
    });
  };
  return (
    <FormCard
      title="New API token"
      description={
        <>
          For a maintenance-management system or script: it acts with the role and sites chosen
          here, sent as <code className="font-mono text-[13px]">Authorization: Bearer …</code>.
          Signing out ends no token; revoke it here.
        </>
      }
      onSubmit={submit}
      className="mt-3 flex flex-wrap items-start gap-3"
      error={formError}
    >
      <InputField
        label="Integration"
        error={errors.name}
        className="min-w-56 flex-1"
        controlSize="sm"
        value={name}
        onChange={(e) => setName(e.target.value)}
      />
      <SelectField
        label="Role"
        className="w-56"
        options={roleOptions}
        value={role}
        onChange={(e) => setRole(e.target.value as Role)}
      />
      <fieldset className="flex flex-col gap-1.5 text-sm">
        <legend className="mb-1.5 font-medium">Sites</legend>
        <div className="flex flex-wrap gap-3">
          {sites.data?.items.map((s) => (
            <label key={s.id} className="flex items-center gap-1.5">
              <input
                type="checkbox"
                checked={siteIds.includes(s.id)}
                onChange={(e) => setSiteIds((ids) => toggled(ids, s.id, e.target.checked))}
              />
              {s.code}
            </label>
          ))}
        </div>
        {errors.siteIds && <span className="text-status-danger">{errors.siteIds}</span>}
      </fieldset>
      <Button type="submit" variant="primary" busy={issue.isPending} className="mt-6.5 h-9">
        Issue token
      </Button>
    </FormCard>
  );
}

export function ApiTokensPanel() {
  const tokens = useApiTokens();
  const sites = useSites();
  const revoke = useRevokeApiToken();
  const now = useNow(30_000);
  const [shown, setShown] = useState<string | null>(null);
  const [pending, setPending] = useState<ApiToken | null>(null);
  const [actionError, setActionError] = useState<string | null>(null);
  const codeOf = (id: number) => sites.data?.items.find((s) => s.id === id)?.code ?? `#${id}`;
  return (
    <section aria-labelledby="api-tokens-heading" className="flex flex-col gap-3">
      <h2 id="api-tokens-heading" className="text-base font-semibold">
        API tokens
      </h2>
      <IssueTokenForm onIssued={setShown} />
      <QueryTable
        query={tokens}
        empty={{ title: 'No API tokens yet', description: 'Issue one above; it is shown once.' }}
        caption="API tokens"
        columns={['Integration', 'Role and sites', 'Token', 'Issued', 'Last used']}
        row={(t) => (
          <tr key={t.id} className="border-b border-line last:border-0">
            <td className="px-4 py-2.5 font-medium">{t.name}</td>
            <td className="px-4 py-2.5">
              {roleLabels[t.role]}
              <span className="ml-1.5 font-mono text-xs text-ink-faint">
                {t.role === 'admin' ? 'all sites' : t.siteIds.map(codeOf).join(', ')}
              </span>
            </td>
            <td className="px-4 py-2.5 font-mono text-[13px]">{t.tokenPrefix}…</td>
            <td className="px-4 py-2.5">
              {formatDateTime(t.createdAt)}
              {t.createdBy && <span className="text-ink-muted"> by {t.createdBy}</span>}
            </td>
            <td className="px-4 py-2.5">
              <Age at={t.lastUsedAt} now={now} />
            </td>
            <td className="px-4 py-2.5 text-right whitespace-nowrap">
              {t.revokedAt ? (
                <span className="text-status-danger">Revoked {formatDateTime(t.revokedAt)}</span>
              ) : (
                <Button
                  size="sm"
                  variant="ghost"
                  className="text-status-danger"
                  onClick={() => setPending(t)}
                >
                  Revoke
                </Button>
              )}
            </td>
          </tr>
        )}
      />
      <ConfirmDialog
        open={pending !== null}
        title={`Revoke the token of ${pending?.name ?? ''}?`}
        error={actionError}
        confirmLabel="Revoke token"
        busy={revoke.isPending}
        onConfirm={() =>
          pending &&
          revoke.mutateAsync(pending.id).then(
            () => setPending(null),
            (e: Error) => setActionError(e.message),
          )
        }
        onCancel={() => {
          setPending(null);
          setActionError(null);
        }}
      >
        The token stops working at once and cannot be restored. Issue a new one to connect the
        integration again.
      </ConfirmDialog>
      <SecretOnceDialog
        title="API token"
        label="Token"
        secret={shown}
        advice="Put it into the integration's configuration now. Turnstone keeps only a hash; if it is lost, revoke it and issue another."
        onClose={() => setShown(null)}
      />
    </section>
  );
}
