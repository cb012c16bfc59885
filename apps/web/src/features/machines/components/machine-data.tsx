import type { ReactNode } from 'react';
import type { MachineDetail } from '@turnstone/contracts/points';
import { Card } from '../../../components/ui/card.tsx';
import { TableHead } from '../../../components/ui/table-head.tsx';
import { machineTypeLabels } from '../../../lib/machine-labels.ts';

const fix = (v: number, d: number) => v.toFixed(d);

/** The machine's bearings or gears, a line each: its name and its geometry; nothing if none. */
function PartList({
  title,
  parts,
}: {
  title: string;
  parts: { id: number; name: string; detail: ReactNode }[];
}) {
  if (parts.length === 0) return null;
  return (
    <>
      <h3 className="mt-4 mb-1 text-sm font-semibold text-ink">{title}</h3>
      <ul className="flex flex-col gap-1 text-[13px]">
        {parts.map((p) => (
          <li key={p.id}>
            <span className="text-ink">{p.name}</span>{' '}
            <span className="font-mono text-ink-muted">{p.detail}</span>
          </li>
        ))}
      </ul>
    </>
  );
}

/** Machine data, components and fault frequencies, for the engineer. */
export function MachineData({ machine }: { machine: MachineDetail }) {
  const m = machine;
  const rows: [string, string][] = [
    ['Type', machineTypeLabels[m.type]],
    ['Nominal speed', `${fix(m.nominalRpm, 0)} r/min (${fix(m.nominalRpm / 60, 2)} Hz)`],
    ['ISO 20816-3 group', `Group ${m.isoGroup}, ${m.foundation} foundation`],
    ['Criticality', m.criticality],
    ['Power', m.powerKw === null ? '—' : `${fix(m.powerKw, 0)} kW`],
  ];
  if (m.bladeCount) rows.push(['Blades', String(m.bladeCount)]);
  if (m.vaneCount) rows.push(['Vanes', String(m.vaneCount)]);
  rows.push([
    'Supply frequency',
    m.lineHz === null ? 'none or not known' : `${m.lineHz} Hz (2 × line ${2 * m.lineHz} Hz)`,
  ]);
  return (
    <div className="grid gap-4 lg:grid-cols-[22rem_minmax(0,1fr)]">
      <Card className="p-4">
        <h2 className="mb-2 text-sm font-semibold text-ink">Machine data</h2>
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1.5 text-sm">
          {rows.map(([k, v]) => (
            <div key={k} className="contents">
              <dt className="text-ink-muted">{k}</dt>
              <dd className="font-mono text-[13px] text-ink">{v}</dd>
            </div>
          ))}
        </dl>
        <PartList
          title="Bearings"
          parts={m.bearings.map((b) => ({
            id: b.id,
            name: b.name,
            detail: (
              <>
                {b.designation ?? ''} n={b.rollingElements} d={fix(b.ballDiameterMm, 2)}&nbsp;mm D=
                {fix(b.pitchDiameterMm, 1)}&nbsp;mm φ={fix(b.contactAngleDeg, 1)}°
              </>
            ),
          }))}
        />
        <PartList
          title="Gears"
          parts={m.gears.map((g) => ({
            id: g.id,
            name: g.name,
            detail: `${g.teeth}/${g.mateTeeth} teeth, ×${fix(g.speedRatio, 3)}`,
          }))}
        />
      </Card>
      <Card className="overflow-x-auto p-4">
        <h2 className="mb-2 text-sm font-semibold text-ink">
          Fault frequencies{' '}
          <span className="font-normal text-ink-muted">
            (at nominal speed; real bearings run 1–2 % lower)
          </span>
        </h2>
        <table className="w-full text-left text-sm">
          <TableHead
            look="facts"
            columns={[
              'Name',
              { label: 'Order', numeric: true },
              { label: 'Hz', numeric: true },
              { label: 'CPM', numeric: true },
            ]}
          />
          <tbody className="font-mono text-[13px]">
            {m.faultFrequencies.map((f) => (
              <tr key={f.name} className="border-b border-line/60">
                <td className="py-1 pr-4 font-sans text-ink">{f.name}</td>
                <td className="py-1 pr-4 text-right">{fix(f.order, 3)}×</td>
                <td className="py-1 pr-4 text-right">{f.hz === null ? '—' : fix(f.hz, 2)}</td>
                <td className="py-1 text-right">{f.hz === null ? '—' : fix(f.hz * 60, 0)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Card>
    </div>
  );
}
