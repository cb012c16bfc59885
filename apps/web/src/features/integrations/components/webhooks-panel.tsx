import { webhookEventTypes, type WebhookEventType } from '@turnstone/contracts/webhooks';
import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { FormCard } from '../../../components/ui/form-card.tsx';
import { InputField } from '../../../components/ui/field.tsx';
import { useSaveErrors } from '../../../hooks/use-save-errors.ts';
import { toggled } from '../../../lib/toggled.ts';
import {
  useCreateWebhook,
  useDeleteWebhook,
  useUpdateWebhook,
} from '../api/change-integrations.ts';
import { useWebhooks } from '../api/get-integrations.ts';
import { QueryTable } from '../../../components/ui/query-table.tsx';
import { SecretOnceDialog } from '../../../components/ui/secret-once-dialog.tsx';

function AddWebhookForm({ onAdded }: { onAdded: (secret: string) => void }) {
  const create = useCreateWebhook();
  const [name, setName] = useState('');
  const [url, setUrl] = useState('');
  const [events, setEvents] = useState<WebhookEventType[]>([...webhookEventTypes]);
  const { errors, formError, save } = useSaveErrors();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save(create.mutateAsync({ name, url, events }), (created) => {
      onAdded(created.secret);
      setName('');
      setUrl('');
    });
  };
  return (
    <FormCard
      title="New webhook receiver"
      description="Each event is posted as JSON and signed (Standard Webhooks: webhook-id, webhook-timestamp, webhook-signature). A receiver that is down is tried again; an event it took is never sent twice. The server posts to the address given, wherever it points."
      onSubmit={submit}
      className="mt-3 flex flex-col gap-3"
      error={formError}
    >
      <div className="flex flex-wrap items-start gap-3">
        <InputField
          label="Name"
          error={errors.name}
          className="w-56"
          controlSize="sm"
          value={name}
          onChange={(e) => setName(e.target.value)}
        />
        <InputField
          label="URL"
          error={errors.url}
          className="min-w-72 flex-1"
          controlSize="sm"
          type="url"
          placeholder="https://cmms.example.org/hooks/turnstone"
          value={url}
          onChange={(e) => setUrl(e.target.value)}
        />
      </div>
      <fieldset className="text-sm">
        <legend className="mb-1.5 font-medium">Events</legend>
        <div className="flex flex-wrap gap-3">
          {webhookEventTypes.map((t) => (
            <label key={t} className="flex items-center gap-1.5 font-mono text-[13px]">
              <input
                type="checkbox"
                checked={events.includes(t)}
                onChange={(e) => setEvents((list) => toggled(list, t, e.target.checked))}
              />
              {t}
            </label>
          ))}
        </div>
        {errors.events && <span className="text-status-danger">{errors.events}</span>}
      </fieldset>
      <div>
        <Button type="submit" variant="primary" busy={create.isPending}>
          Add receiver
        </Button>
      </div>
    </FormCard>
  );
}

export function WebhooksPanel() {
  const hooks = useWebhooks();
  const update = useUpdateWebhook();
  const remove = useDeleteWebhook();
  const [secret, setSecret] = useState<string | null>(null);
  const [actionError, setActionError] = useState<string | null>(null);
  const fail = (e: Error) => setActionError(e.message);
  return (
    <section aria-labelledby="webhooks-heading" className="flex flex-col gap-3">
      <h2 id="webhooks-heading" className="text-base font-semibold">
        Webhooks
      </h2>
      <AddWebhookForm onAdded={setSecret} />
      {actionError && (
        <p role="alert" className="text-sm text-status-danger">
          {actionError}
        </p>
      )}
      <QueryTable
        query={hooks}
        empty={{
          title: 'No webhook receivers',
          description: 'Add one above; its signing secret is shown once.',
        }}
        caption="Webhook receivers"
        columns={['Name', 'URL', 'Events', 'Deliveries']}
        row={(h) => (
          <tr key={h.id} className="border-b border-line last:border-0">
            <td className="px-4 py-2.5 font-medium">
              {h.name}
              {!h.enabled && <span className="ml-1.5 text-xs text-ink-muted">(paused)</span>}
            </td>
            <td className="max-w-72 truncate px-4 py-2.5 font-mono text-[13px]" title={h.url}>
              {h.url}
            </td>
            <td className="px-4 py-2.5 font-mono text-xs">{h.events.join(', ')}</td>
            <td className="px-4 py-2.5">
              {h.pending === 0 && h.undelivered === 0 ? (
                <span className="text-ink-muted">all delivered</span>
              ) : (
                <>
                  {h.pending > 0 && <span>{h.pending} waiting for a retry</span>}
                  {h.undelivered > 0 && (
                    <span className="ml-1.5 text-status-danger">{h.undelivered} not delivered</span>
                  )}
                </>
              )}
            </td>
            <td className="px-4 py-2.5 text-right whitespace-nowrap">
              <Button
                size="sm"
                variant="ghost"
                onClick={() =>
                  update
                    .mutateAsync({ id: h.id, enabled: !h.enabled })
                    .then(() => setActionError(null), fail)
                }
              >
                {h.enabled ? 'Pause' : 'Resume'}
              </Button>
              <Button
                size="sm"
                variant="ghost"
                className="text-status-danger"
                onClick={() => remove.mutateAsync(h.id).then(() => setActionError(null), fail)}
              >
                Remove
              </Button>
            </td>
          </tr>
        )}
      />
      <SecretOnceDialog
        title="Signing secret"
        label="Secret"
        secret={secret}
        advice="Give it to the receiver to verify each delivery's webhook-signature. It cannot be shown again; to change it, remove the receiver and add it anew."
        onClose={() => setSecret(null)}
      />
    </section>
  );
}
