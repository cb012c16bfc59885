import { useState } from 'react';
import type { Subscription, SubscriptionSettingsResponse } from '@turnstone/contracts/account';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Select } from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { useSaveSubscriptions, useSubscriptions } from '../api/account.ts';

/** A scope encoded for one select: `s:<siteId>` or `m:<machineId>`. */
const scopeOf = (s: Subscription) => (s.siteId !== null ? `s:${s.siteId}` : `m:${s.machineId}`);

function Editor({ data, showDigest }: { data: SubscriptionSettingsResponse; showDigest: boolean }) {
  const save = useSaveSubscriptions();
  const [items, setItems] = useState<Subscription[]>(data.items);
  const [digest, setDigest] = useState(data.weeklyDigest);
  const [saved, setSaved] = useState(false);
  const { sites, machines } = data.options;
  const set = (i: number, patch: Partial<Subscription>) => {
    setSaved(false);
    setItems(items.map((it, j) => (j === i ? { ...it, ...patch } : it)));
  };
  return (
    <Card className="p-4">
      <h2 className="text-sm font-semibold">Notifications by e-mail</h2>
      <p className="mt-0.5 text-sm text-ink-muted">
        Which alerts reach you: a site or one machine, from which level, and when. Raised, escalated
        and cleared alerts each send one message.
      </p>
      <div className="mt-3 flex flex-col gap-2">
        {items.length === 0 && <p className="text-sm text-ink-muted">No alert e-mails.</p>}
        {items.map((s, i) => (
          <div
            key={i}
            className="grid items-center gap-2 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_minmax(0,1fr)_auto]"
            role="group"
            aria-label={`Rule ${i + 1}`}
          >
            <Select
              aria-label="Scope"

              value={scopeOf(s)}
              onChange={(e) => {
                const [kind, id] = e.target.value.split(':');
                set(
                  i,
                  kind === 's'
                    ? { siteId: Number(id), machineId: null }
                    : { siteId: null, machineId: Number(id) },
                );
              }}
            >
              <optgroup label="Sites">
                {sites.map((x) => (
                  <option key={x.id} value={`s:${x.id}`}>
                    Site {x.code} — {x.name}
                  </option>
                ))}
              </optgroup>
              <optgroup label="Machines">
                {machines.map((m) => (
                  <option key={m.id} value={`m:${m.id}`}>
                    {m.name}
                  </option>
                ))}
              </optgroup>
            </Select>
            <Select
              aria-label="From level"

              value={s.minLevel}
              onChange={(e) => set(i, { minLevel: e.target.value as Subscription['minLevel'] })}
            >
              <option value="alert">Alert and danger</option>
              <option value="danger">Danger only</option>
            </Select>
            <Select
              aria-label="When"

              value={s.cadence}
              onChange={(e) => set(i, { cadence: e.target.value as Subscription['cadence'] })}
            >
              <option value="immediate">At once</option>
              <option value="hourly">On the hour</option>
            </Select>
            <Button
              size="sm"
              variant="ghost"
              onClick={() => setItems(items.filter((_, j) => j !== i))}
              aria-label={`Remove rule ${i + 1}`}
            >
              Remove
            </Button>
          </div>
        ))}
        {sites[0] && (
          <div>
            <Button
              size="sm"
              onClick={() =>
                setItems([
                  ...items,
                  {
                    siteId: sites[0]!.id,
                    machineId: null,
                    minLevel: 'alert',
                    cadence: 'immediate',
                  },
                ])
              }
            >
              Add a rule
            </Button>
          </div>
        )}
        {showDigest && (
          <label className="mt-2 flex items-center gap-2 text-sm">
            <input type="checkbox" checked={digest} onChange={(e) => setDigest(e.target.checked)} />
            Weekly digest on Monday morning (the review of last week)
          </label>
        )}
        <div className="mt-2 flex items-center gap-3">
          <Button
            variant="primary"
            busy={save.isPending}
            onClick={() =>
              save.mutate({ items, weeklyDigest: digest }, { onSuccess: () => setSaved(true) })
            }
          >
            Save notifications
          </Button>
          {saved && (
            <p role="status" className="text-sm text-ink-muted">
              Saved.
            </p>
          )}
          {save.isError && (
            <p role="alert" className="text-sm text-status-danger">
              {save.error.message}
            </p>
          )}
        </div>
      </div>
    </Card>
  );
}

export function NotificationSettings({ showDigest }: { showDigest: boolean }) {
  const q = useSubscriptions();
  if (q.isPending) return <LoadingPanel />;
  if (q.isError)
    return (
      <Card>
        <ErrorState error={q.error} onRetry={() => void q.refetch()} />
      </Card>
    );
  return <Editor data={q.data} showDigest={showDigest} />;
}
