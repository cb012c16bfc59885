import type { MachineDetail } from '@turnstone/contracts/points';
import { Card } from '../../../components/ui/card.tsx';
import { TextLink } from '../../../components/ui/text-link.tsx';
import { paths } from '../../../config/paths.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { HINTS_CAUTION, HintList } from '../../points/components/diagnosis-hints.tsx';

/** The current diagnosis hints of the machine: each point's latest capture that has any. */
export function MachineHints({ machine }: { machine: MachineDetail }) {
  const withHints = machine.points.filter((p) => (p.latest?.diagnosis?.hints.length ?? 0) > 0);
  return (
    <Card className="flex flex-col gap-3 p-4">
      <div>
        <h2 className="text-sm font-semibold text-ink">Current diagnosis hints</h2>
        <p className="text-xs text-ink-muted">{HINTS_CAUTION}</p>
      </div>
      {withHints.length === 0 ? (
        <p className="text-sm text-ink-muted">No hints on the points&apos; latest captures.</p>
      ) : (
        <ul className="grid gap-3 lg:grid-cols-2">
          {withHints.map((p) => (
            <li key={p.id} className="flex flex-col gap-1.5">
              <h3 className="text-sm">
                <TextLink to={paths.app.point.getHref(p.id)} className="font-medium">
                  {p.name}
                </TextLink>{' '}
                <span className="font-mono text-xs text-ink-muted">
                  {p.tag} · {formatDateTime(p.latest!.takenAt)}
                </span>
              </h3>
              <HintList diagnosis={p.latest!.diagnosis} headingLevel={4} />
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
