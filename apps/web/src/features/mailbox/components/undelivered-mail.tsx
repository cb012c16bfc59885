import type { UndeliveredMail } from '@turnstone/contracts/mail';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { TableHead } from '../../../components/ui/table-head.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useResendMail, useUndeliveredMail } from '../api/undelivered-mail.ts';

const stateText = (m: UndeliveredMail) =>
  m.state === 'failed'
    ? 'Failed after its last attempt'
    : m.state === 'uncertain'
      ? 'Uncertain: the send was cut off; it may or may not have arrived'
      : `Retrying${m.nextAttemptAt ? ` at ${formatDateTime(m.nextAttemptAt)}` : ''}`;

function ResendButton({ mail }: { mail: UndeliveredMail }) {
  const resend = useResendMail();
  const ask = () => {
    const question =
      mail.state === 'uncertain'
        ? `Send “${mail.subject}” to ${mail.to} again? It may already have arrived, so they could get it twice.`
        : `Send “${mail.subject}” to ${mail.to} again?`;
    if (window.confirm(question)) resend.mutate(mail.id);
  };
  return (
    <div className="flex flex-col items-end gap-1">
      <Button
        size="sm"
        onClick={ask}
        busy={resend.isPending}
        aria-label={`Send again: ${mail.subject}`}
      >
        Send again
      </Button>
      {resend.isError && (
        <p role="alert" className="text-xs text-status-danger">
          {resend.error.message}
        </p>
      )}
    </div>
  );
}

/**
 * Outgoing mail (alerts, digests, invites) that has not been delivered, for the admin: what
 * the sender still retries, and what it gave up on or cannot vouch for. Shown only when
 * there is any; with a real relay this is where a delivery problem shows.
 */
export function UndeliveredMailPanel() {
  const list = useUndeliveredMail();
  if (list.isPending) return null;
  if (list.isError)
    return (
      <Card>
        <ErrorState
          title="Could not load the undelivered mail"
          error={list.error}
          onRetry={() => void list.refetch()}
        />
      </Card>
    );
  const items = list.data.items;
  if (items.length === 0) return null;
  return (
    <Card className="overflow-x-auto" role="region" aria-labelledby="undelivered-heading">
      <div className="px-4 pt-3">
        <h2 id="undelivered-heading" className="text-sm font-semibold">
          Not delivered ({items.length})
        </h2>
        <p className="text-xs text-ink-muted">
          Alert mail is a convenience, not an alarm path: check the Alerts screen for anything
          listed here.
        </p>
      </div>
      <table className="mt-2 w-full text-sm">
        <TableHead
          columns={['To', 'Subject', 'State', 'Attempts', 'Last error']}
          actions={{ label: 'Action', visible: false }}
        />
        <tbody>
          {items.map((m) => (
            <tr key={m.id} className="border-t border-line align-top">
              <td className="px-3 py-2 font-mono text-xs">{m.to}</td>
              <td className="px-3 py-2">
                {m.subject}
                <span className="block text-xs text-ink-muted">
                  {m.kind} · queued {formatDateTime(m.createdAt)}
                </span>
              </td>
              <td className="px-3 py-2 text-xs">{stateText(m)}</td>
              <td className="px-3 py-2 font-mono text-xs">{m.attempts}</td>
              <td className="max-w-xs px-3 py-2 font-mono text-xs break-words text-ink-muted">
                {m.lastError ?? '—'}
              </td>
              <td className="px-3 py-2 text-right">
                {m.state !== 'retrying' && <ResendButton mail={m} />}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </Card>
  );
}
