import type { TrendResponse } from '@turnstone/contracts/trend';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import type { TrendEventMarker } from '../../../components/charts/trend-chart.tsx';

const alertWords: Record<TrendResponse['events'][number]['kind'], string> = {
  raised: 'raised',
  escalated: 'escalated to danger',
  acknowledged: 'acknowledged',
  cleared: 'cleared',
};
const findingStates = { open: 'open', planned: 'planned', done: 'done' } as const;

/**
 * A trend answer's events as the chart's markers with their text, oldest first: alert
 * changes (who and the note), findings (title and state), limit changes of the band (who,
 * levels before → after, the reason) and captures uploaded from a portable instrument's file.
 * `d` is already in the user's units and `unit` is its shown unit.
 */
export function trendEventMarkers(d: TrendResponse, unit: string): TrendEventMarker[] {
  const n = (v: number) => formatValue(v);
  const markers: TrendEventMarker[] = [
    ...d.events.map((e) => ({
      t: e.t,
      kind: e.kind,
      label: `${e.level === 'danger' ? 'Danger' : 'Alert'} ${alertWords[e.kind]}${
        e.by ? ` by ${e.by}` : ''
      }${e.note ? `: “${e.note}”` : ''}`,
    })),
    ...d.findings.map((f) => ({
      t: f.t,
      kind: 'finding' as const,
      label: `Finding (${findingStates[f.state]}): ${f.title}${f.workOrderRef ? ` (${f.workOrderRef})` : ''}`,
    })),
    ...d.limitChanges.map((c) => {
      const who = c.by ? ` by ${c.by}` : '';
      const why = c.reason ? ` — “${c.reason}”` : '';
      const levels =
        c.before && c.after
          ? `alert ${n(c.before.alert)} → ${n(c.after.alert)} ${unit}, danger ${n(c.before.danger)} → ${n(c.after.danger)} ${unit}`
          : c.after
            ? `alert ${n(c.after.alert)} ${unit}, danger ${n(c.after.danger)} ${unit}`
            : '';
      const what =
        c.kind === 'baseline'
          ? 'Statistical baseline established'
          : c.kind === 'added'
            ? `Band added${who}`
            : c.kind === 'removed'
              ? `Band removed${who}`
              : `Limits changed${who}`;
      return {
        t: c.t,
        kind: 'limits' as const,
        label: `${what}${levels ? `: ${levels}` : ''}${why}`,
      };
    }),
    ...d.uploads.map((u) => ({
      t: u.t,
      v: u.v,
      kind: 'upload' as const,
      label: `Portable-instrument capture${u.fileName ? ` “${u.fileName}”` : ''}${
        u.by ? ` uploaded by ${u.by}` : ''
      }: ${n(u.v)} ${unit}`,
    })),
  ];
  return markers.sort((a, b) => Date.parse(String(a.t)) - Date.parse(String(b.t)));
}
