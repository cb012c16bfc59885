import type { AlertDetail } from '@turnstone/contracts/alerts';
import { Sparkline } from '../../../components/charts/sparkline.tsx';
import { useUnits } from '../../account/api/use-units.ts';

/**
 * The alert's band over its newest values with the alert and danger levels in force, and a
 * legend that names them (the lines alone would not say which is which).
 */
export function BandSparkline({ alert: a }: { alert: AlertDetail }) {
  const values = a.recentValues.map((v) => v.value);
  const alertLevel = a.clearRule?.alertLevel ?? (a.level === 'alert' ? a.limit : null);
  const dangerLevel = a.clearRule?.dangerLevel ?? (a.level === 'danger' ? a.limit : null);
  const units = useUnits();
  const f = (v: number) => units.format(v, a.unit);
  const label =
    values.length > 0
      ? `${a.bandName}, last ${values.length} values: from ${f(values[0]!)} to ${f(values[values.length - 1]!)}`
      : `${a.bandName}: no values`;
  return (
    <figure className="flex flex-col gap-1" data-testid="alert-sparkline">
      <Sparkline
        values={values}
        alertLevel={alertLevel}
        dangerLevel={dangerLevel}
        width={280}
        height={56}
        label={label}
      />
      <figcaption className="flex flex-wrap gap-x-3 text-xs text-ink-muted">
        <span>Last {values.length} values</span>
        {alertLevel !== null && (
          <span>
            <span aria-hidden="true" className="text-status-alert">
              ╌
            </span>{' '}
            alert {f(alertLevel)}
          </span>
        )}
        {dangerLevel !== null && (
          <span>
            <span aria-hidden="true" className="text-status-danger">
              ━
            </span>{' '}
            danger {f(dangerLevel)}
          </span>
        )}
      </figcaption>
    </figure>
  );
}
