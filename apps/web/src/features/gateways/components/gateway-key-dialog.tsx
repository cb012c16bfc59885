import type { GatewayKey } from '@turnstone/contracts/gateways';
import { useState } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { Modal } from '../../../components/ui/modal.tsx';

/** The API key, shown this once. Closing needs a deliberate click, not a stray Escape. */
export function GatewayKeyDialog({
  gatewayName,
  gatewayKey,
  onClose,
}: {
  gatewayName: string;
  gatewayKey: GatewayKey | null;
  onClose: () => void;
}) {
  const [copied, setCopied] = useState<'yes' | 'failed' | null>(null);
  const copy = async () => {
    if (!gatewayKey) return;
    try {
      await navigator.clipboard.writeText(gatewayKey.apiKey);
      setCopied('yes');
    } catch {
      setCopied('failed');
    }
  };
  return (
    <Modal
      open={gatewayKey !== null}
      title={`API key for ${gatewayName}`}
      onClose={() => {
        setCopied(null);
        onClose();
      }}
      dismissable={false}
    >
      <div
        role="alert"
        className="flex gap-2.5 rounded-md border border-status-alert/40 bg-status-alert/10 px-3 py-2.5 text-sm"
      >
        <svg
          viewBox="0 0 12 12"
          aria-hidden="true"
          className="mt-1 size-3 shrink-0 text-status-alert"
        >
          <path d="M6 1.2 11 10.3H1Z" fill="currentColor" />
        </svg>
        <p>
          <strong>This key is shown only once.</strong> Copy it into the gateway&apos;s
          configuration now. Turnstone keeps only a hash; if the key is lost, rotate it to get a new
          one.
        </p>
      </div>
      <label className="flex flex-col gap-1.5 text-sm font-medium">
        API key
        <input
          readOnly
          value={gatewayKey?.apiKey ?? ''}
          onFocus={(e) => e.currentTarget.select()}
          aria-label="API key"
          className="h-10 w-full rounded-md border border-line-strong bg-sunken px-3 font-mono text-[13px] text-ink"
        />
      </label>
      <IngestExample apiKey={gatewayKey?.apiKey ?? ''} />
      <div className="flex flex-wrap items-center gap-2">
        <Button variant="primary" onClick={() => void copy()}>
          Copy key
        </Button>
        {copied === 'yes' && (
          <span role="status" className="text-sm text-status-ok">
            Copied to the clipboard.
          </span>
        )}
        {copied === 'failed' && (
          <span role="status" className="text-sm text-status-danger">
            Could not copy; select the key and copy it by hand.
          </span>
        )}
        <Button className="ml-auto" onClick={onClose}>
          I have stored the key
        </Button>
      </div>
    </Modal>
  );
}

/** Where the gateway posts and one example request with this key (the ingest contract). */
function IngestExample({ apiKey }: { apiKey: string }) {
  const url = `${window.location.origin}/api/ingest/v1/snapshots`;
  const example = [
    `curl -X POST ${url} \\`,
    `  -H 'Authorization: Bearer ${apiKey}' \\`,
    `  -H 'Content-Type: application/json' \\`,
    `  -d '{"uid":"gw1-2026-12-03T08:00:00Z","pointTag":"MFP-P101-MDE-H",`,
    `       "takenAt":"2026-12-03T08:00:00Z","sampleRateHz":25600,"encoding":"int16",`,
    `       "samples":"<base64 of the little-endian samples>",`,
    `       "adc":{"bits":16,"fullScaleV":10},"sensor":{"sensitivityMvPerG":100},"speedRpm":1482}'`,
  ].join('\n');
  return (
    <div className="flex flex-col gap-1.5 text-sm">
      <p className="font-medium">Ingest address</p>
      <code className="rounded-md bg-sunken px-3 py-2 font-mono text-[13px] break-all">{url}</code>
      <p className="font-medium">Example request</p>
      <pre
        aria-label="Example request"
        className="max-h-48 overflow-auto rounded-md bg-sunken px-3 py-2 font-mono text-[11px] break-all whitespace-pre-wrap"
      >
        {example}
      </pre>
      <p className="text-xs text-ink-muted">
        One capture per request, or {'{"snapshots": [ … ]}'} for several; the full description is in
        the ingest API document (/api/ingest/v1/openapi.json).
      </p>
    </div>
  );
}
