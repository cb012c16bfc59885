import type { GatewayKey } from '@turnstone/contracts/gateways';
import { SecretOnceDialog } from '../../../components/ui/secret-once-dialog.tsx';

/** A new or rotated gateway's API key, shown this once, with how the gateway posts. */
export function GatewayKeyDialog({
  gatewayName,
  gatewayKey,
  onClose,
}: {
  gatewayName: string;
  gatewayKey: GatewayKey | null;
  onClose: () => void;
}) {
  return (
    <SecretOnceDialog
      title={`API key for ${gatewayName}`}
      label="API key"
      what="key"
      secret={gatewayKey?.apiKey ?? null}
      advice="Copy it into the gateway's configuration now. Turnstone keeps only a hash; if the key is lost, rotate it to get a new one."
      onClose={onClose}
    >
      <IngestExample apiKey={gatewayKey?.apiKey ?? ''} />
    </SecretOnceDialog>
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
