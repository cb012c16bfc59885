import { useState, type ReactNode } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Input } from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { cn } from '../../../lib/cn.ts';
import { useMailbox, useMessage } from '../api/get-mailbox.ts';

const when = (iso: string) => `${iso.slice(0, 16).replace('T', ' ')} UTC`;

/** Plain text with links to this installation made clickable (others stay text). */
function LinkedText({ text }: { text: string }) {
  const origin = window.location.origin;
  const parts: ReactNode[] = [];
  const re = /https?:\/\/[^\s<>"]+/g;
  let last = 0;
  for (const m of text.matchAll(re)) {
    parts.push(text.slice(last, m.index));
    const url = m[0];
    parts.push(
      url.startsWith(origin + '/') ? (
        <a key={m.index} href={url} className="text-accent underline" rel="noreferrer">
          {url}
        </a>
      ) : (
        url
      ),
    );
    last = m.index + url.length;
  }
  parts.push(text.slice(last));
  return <pre className="font-mono text-xs leading-relaxed whitespace-pre-wrap">{parts}</pre>;
}

function Reader({ id }: { id: number }) {
  const msg = useMessage(id);
  const [view, setView] = useState<'html' | 'text'>('html');
  if (msg.isPending) return <LoadingPanel />;
  if (msg.isError) return <ErrorState error={msg.error} onRetry={() => void msg.refetch()} />;
  const m = msg.data;
  const shown = view === 'html' && m.html ? 'html' : 'text';
  return (
    <article className="flex min-h-0 flex-1 flex-col gap-3 p-4" aria-label="Message">
      <h2 className="text-base font-semibold">{m.subject}</h2>
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm">
        <dt className="text-ink-muted">From</dt>
        <dd className="font-mono text-xs">{m.from}</dd>
        <dt className="text-ink-muted">To</dt>
        <dd className="font-mono text-xs">{m.to}</dd>
        <dt className="text-ink-muted">Received</dt>
        <dd className="font-mono text-xs">{when(m.receivedAt)}</dd>
      </dl>
      <div className="flex gap-2" role="group" aria-label="Show part">
        <Button
          size="sm"
          variant={shown === 'html' ? 'primary' : 'secondary'}
          disabled={!m.html}
          onClick={() => setView('html')}
          aria-pressed={shown === 'html'}
        >
          HTML
        </Button>
        <Button
          size="sm"
          variant={shown === 'text' ? 'primary' : 'secondary'}
          onClick={() => setView('text')}
          aria-pressed={shown === 'text'}
        >
          Text
        </Button>
      </div>
      {shown === 'html' ? (
        // sandbox="" : no scripts, no forms, no navigation, an opaque origin.
        <iframe
          title={`HTML part of “${m.subject}”`}
          sandbox=""
          srcDoc={m.html ?? ''}
          className="min-h-[420px] w-full flex-1 rounded-md border border-line bg-white"
        />
      ) : (
        <div className="rounded-md border border-line bg-surface p-3">
          <LinkedText text={m.text ?? '(no text part)'} />
        </div>
      )}
    </article>
  );
}

export function MailboxView() {
  const [search, setSearch] = useState('');
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-3">
      <label className="flex max-w-md flex-col gap-1 text-sm font-medium">
        Search recipient or subject
        <Input
          type="search"
          value={search}
          placeholder="operator@ or P-101"
          onChange={(e) => setSearch(e.target.value)}
        />
      </label>
      <MailboxList search={search} />
    </div>
  );
}

function MailboxList({ search }: { search: string }) {
  const list = useMailbox(search);
  const [selected, setSelected] = useState<number | null>(null);
  if (list.isPending) return <LoadingPanel />;
  if (list.isError)
    return (
      <Card>
        <ErrorState error={list.error} onRetry={() => void list.refetch()} />
      </Card>
    );
  const items = list.data.items;
  if (items.length === 0)
    return (
      <Card>
        {search.trim() ? (
          <EmptyState title="No message matches" description="Try part of an address or subject." />
        ) : (
          <EmptyState
            title="No mail yet"
            description="Alert notifications, invites and reset links appear here as the local mail fake receives them."
          />
        )}
      </Card>
    );
  const current =
    selected !== null && items.some((i) => i.id === selected) ? selected : items[0]!.id;
  return (
    <Card className="flex min-h-0 flex-1 flex-col overflow-hidden md:flex-row">
      <ul
        className="max-h-72 shrink-0 overflow-y-auto border-b border-line md:max-h-none md:w-96 md:border-r md:border-b-0"
        aria-label="Received messages"
      >
        {items.map((i) => (
          <li key={i.id}>
            <button
              type="button"
              onClick={() => setSelected(i.id)}
              aria-current={i.id === current || undefined}
              className={cn(
                'block w-full border-b border-line px-3 py-2 text-left hover:bg-sunken',
                i.id === current && 'bg-accent-soft',
              )}
            >
              <span className="block text-sm font-medium break-words">{i.subject}</span>
              <span className="flex justify-between gap-2 font-mono text-xs text-ink-muted">
                <span className="truncate">{i.to}</span>
                <span className="shrink-0">{when(i.receivedAt)}</span>
              </span>
            </button>
          </li>
        ))}
      </ul>
      <div className="flex min-h-0 min-w-0 flex-1 flex-col overflow-y-auto">
        <Reader key={current} id={current} />
      </div>
    </Card>
  );
}
