import { zodResolver } from '@hookform/resolvers/zod';
import { createGatewaySchema, type Gateway, type GatewayKey } from '@turnstone/contracts/gateways';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '../../../components/ui/button.tsx';
import { FormCard } from '../../../components/ui/form-card.tsx';
import { type SelectOption } from '../../../components/ui/field.tsx';
import { FormFields } from '../../../components/ui/form-fields.tsx';
import { useNow } from '../../../hooks/use-now.ts';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { Age } from '../../../components/ui/age.tsx';
import { useCreateGateway, useRevokeGateway, useRotateGateway } from '../api/change-gateway.ts';
import { useGateways, useSites } from '../api/get-gateways.ts';
import { GatewayKeyDialog } from './gateway-key-dialog.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { QueryTable } from '../../../components/ui/query-table.tsx';
import { StrokePath } from '../../../components/ui/icon.tsx';

function CreateGatewayForm({ onCreated }: { onCreated: (name: string, key: GatewayKey) => void }) {
  const sites = useSites();
  const create = useCreateGateway();
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm({
    resolver: zodResolver(createGatewaySchema),
    defaultValues: { siteId: undefined as unknown as number, name: '' },
  });
  const onSubmit = form.handleSubmit((values) => {
    setFormError(null);
    create.mutate(values, {
      onSuccess: (key) => {
        onCreated(values.name, key);
        form.reset({ siteId: values.siteId, name: '' });
      },
      onError: (e) => {
        const details = isApiError(e) && Array.isArray(e.details) ? e.details : [];
        let placed = false;
        for (const d of details as { path?: unknown; message?: string }[]) {
          const path = Array.isArray(d.path) ? d.path.join('.') : d.path;
          if ((path === 'siteId' || path === 'name') && d.message) {
            form.setError(path, { message: d.message });
            placed = true;
          }
        }
        if (!placed) setFormError(e.message);
      },
    });
  });
  return (
    <FormCard
      title="New gateway"
      onSubmit={onSubmit}
      className="mt-3 flex flex-wrap items-start gap-3"
      error={formError}
    >
      <FormFields
        form={form}
        fields={[
          {
            kind: 'select',
            name: 'siteId',
            label: 'Site',
            className: 'w-64',
            options: [
              ['', 'Choose a site…'],
              ...(sites.data?.items ?? []).map((s): SelectOption => [
                s.id,
                `${s.name} (${s.code})`,
              ]),
            ],
            value: 'number',
          },
          {
            kind: 'text',
            name: 'name',
            label: 'Name',
            hint: 'Where it hangs, e.g. “Pump hall cabinet 2”.',
            className: 'min-w-64 flex-1',
            controlSize: 'sm',
          },
        ]}
      />
      <Button type="submit" variant="primary" busy={create.isPending} className="mt-6.5 h-9">
        Create gateway
      </Button>
    </FormCard>
  );
}

type Pending = { action: 'revoke' | 'rotate'; gateway: Gateway } | null;

export function GatewaysPanel() {
  const gateways = useGateways();
  const rotate = useRotateGateway();
  const revoke = useRevokeGateway();
  const now = useNow(30_000);
  const [shown, setShown] = useState<{ name: string; key: GatewayKey } | null>(null);
  const [pending, setPending] = useState<Pending>(null);
  const [actionError, setActionError] = useState<string | null>(null);

  const confirm = () => {
    if (!pending) return;
    const { action, gateway } = pending;
    setActionError(null);
    if (action === 'rotate')
      rotate.mutate(gateway.id, {
        onSuccess: (key) => {
          setPending(null);
          setShown({ name: gateway.name, key });
        },
        onError: (e) => setActionError(e.message),
      });
    else
      revoke.mutate(gateway.id, {
        onSuccess: () => setPending(null),
        onError: (e) => setActionError(e.message),
      });
  };

  return (
    <div className="flex flex-col gap-4">
      <CreateGatewayForm onCreated={(name, key) => setShown({ name, key })} />
      <QueryTable
        query={gateways}
        empty={{
          title: 'No gateways yet',
          description: 'Create one above; its key is shown once.',
        }}
        caption="Gateways"
        columns={['Name', 'Site', 'Key prefix', 'Last seen', 'Posts, last hour', 'State']}
        row={(g) => (
          <tr key={g.id} className="border-b border-line last:border-0">
            <td className="px-4 py-2.5 font-medium">{g.name}</td>
            <td className="px-4 py-2.5">
              {g.siteName} <span className="font-mono text-xs text-ink-faint">{g.siteCode}</span>
            </td>
            <td className="px-4 py-2.5 font-mono text-[13px]">tsg_{g.keyPrefix}_…</td>
            <td className="px-4 py-2.5">
              <Age at={g.lastSeenAt} now={now} />
            </td>
            <td className="px-4 py-2.5 font-mono text-[13px]">{g.postsLastHour}</td>
            <td className="px-4 py-2.5">
              {g.revokedAt ? (
                <span className="inline-flex items-center gap-1.5 text-status-danger">
                  <svg viewBox="0 0 12 12" aria-hidden="true" className="size-3">
                    <StrokePath d="M2 2 10 10M10 2 2 10" width={2} />
                  </svg>
                  <span className="text-ink">Revoked {formatDateTime(g.revokedAt)}</span>
                </span>
              ) : (
                <span className="inline-flex items-center gap-1.5">
                  <svg viewBox="0 0 12 12" aria-hidden="true" className="size-3 text-status-ok">
                    <circle cx="6" cy="6" r="4.5" fill="currentColor" />
                  </svg>
                  Active
                </span>
              )}
            </td>
            <td className="px-4 py-2.5 text-right whitespace-nowrap">
              {!g.revokedAt && (
                <>
                  <Button
                    size="sm"
                    variant="ghost"
                    onClick={() => setPending({ action: 'rotate', gateway: g })}
                  >
                    Rotate key
                  </Button>
                  <Button
                    size="sm"
                    variant="ghost"
                    className="text-status-danger"
                    onClick={() => setPending({ action: 'revoke', gateway: g })}
                  >
                    Revoke
                  </Button>
                </>
              )}
            </td>
          </tr>
        )}
      />

      <ConfirmDialog
        open={pending !== null}
        title={
          pending?.action === 'rotate'
            ? `Rotate the key of ${pending.gateway.name}?`
            : `Revoke ${pending?.gateway.name ?? ''}?`
        }
        error={actionError}
        confirmLabel={pending?.action === 'rotate' ? 'Rotate key' : 'Revoke gateway'}
        busy={rotate.isPending || revoke.isPending}
        onConfirm={confirm}
        onCancel={() => {
          setPending(null);
          setActionError(null);
        }}
      >
        {pending?.action === 'rotate'
          ? 'A new key is made and shown once; the current key stops working at once, so the gateway is refused until it has the new key.'
          : 'The gateway’s key stops working at once and cannot be restored. To connect it again, create a new gateway.'}
      </ConfirmDialog>

      <GatewayKeyDialog
        gatewayName={shown?.name ?? ''}
        gatewayKey={shown?.key ?? null}
        onClose={() => setShown(null)}
      />
    </div>
  );
}
