/**
 * Diagnosis hints: likely causes of a capture's vibration with the peaks that support them.
 * Hints, never verdicts — every view says so and shows the evidence.
 */
import { restateUnits } from '@turnstone/contracts/number-format';
import { useUnits, type Units } from '../../account/api/use-units.ts';
import { diagnosisCodeNames, evidenceUnits } from '@turnstone/contracts/points';
import type {
  Diagnosis,
  DiagnosisCodeName,
  DiagnosisEvidenceItem,
  DiagnosisHintItem,
} from '@turnstone/contracts/points';
import { cn } from '../../../lib/cn.ts';
import { TableHead } from '../../../components/ui/table-head.tsx';

/** "0.252 in/s RMS": an evidence peak in the user's unit system with its measure. */
function evidenceAmplitude(amplitude: number, spectrum: keyof typeof evidenceUnits, units: Units) {
  const [unit, measure] = evidenceUnits[spectrum].split(' ') as [string, string];
  return `${units.format(amplitude, unit)} ${measure}`;
}

export function hintName(code: DiagnosisCodeName): string {
  return diagnosisCodeNames[code];
}

const spectrumNames: Record<DiagnosisEvidenceItem['spectrum'], string> = {
  velocity: 'velocity',
  acceleration: 'acceleration',
  envelope: 'envelope',
};

export const HINTS_CAUTION =
  'Likely causes read from the spectral pattern — hints, not verdicts. Confirm on the machine before acting.';

function EvidenceTable({
  evidence,
  caption,
}: {
  evidence: DiagnosisEvidenceItem[];
  caption: string;
}) {
  const units = useUnits();
  return (
    <table className="mt-1 w-full text-left text-xs">
      <caption className="sr-only">{caption}</caption>
      <TableHead
        look="dense"
        columns={[
          'Peak',
          { label: 'Hz', numeric: true },
          { label: 'Order', numeric: true },
          { label: 'Amplitude', numeric: true },
        ]}
      />
      <tbody className="font-mono text-ink">
        {evidence.map((e, i) => (
          <tr key={i}>
            <td className="py-0.5 pr-2 font-sans">{e.label}</td>
            <td className="py-0.5 pr-2 text-right">{e.hz.toFixed(2)}</td>
            <td className="py-0.5 pr-2 text-right">{e.order.toFixed(2)}</td>
            <td className="py-0.5 text-right">
              {evidenceAmplitude(e.amplitude, e.spectrum, units)}
              <span className="sr-only"> ({spectrumNames[e.spectrum]} spectrum)</span>
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** The hints of one capture as a list (machine page, alert detail). */
export function HintList({
  diagnosis,
  headingLevel = 3,
  showEvidence = true,
}: {
  diagnosis: Diagnosis | null;
  headingLevel?: 3 | 4;
  showEvidence?: boolean;
}) {
  const units = useUnits();
  if (!diagnosis)
    return <p className="text-sm text-ink-muted">No hints stored for this capture.</p>;
  if (diagnosis.hints.length === 0)
    return (
      <p className="text-sm text-ink-muted">
        No hint: nothing in the spectra points to a known cause at a level that matters (from{' '}
        {units.format(diagnosis.severityMmS, 'mm/s')}, {diagnosis.severitySource}).
      </p>
    );
  const H = headingLevel === 3 ? 'h3' : 'h4';
  return (
    <ol className="flex flex-col gap-2">
      {diagnosis.hints.map((h, i) => (
        <li key={`${h.code}-${i}`} className="rounded-md border border-line px-3 py-2">
          <H className="text-sm font-semibold text-ink">
            {hintName(h.code)}{' '}
            <span className="font-mono text-xs font-normal text-ink-muted">
              score {h.confidence.toFixed(2)}
            </span>
          </H>
          <p className="text-sm text-ink">{restateUnits(h.summary, units.system)}</p>
          {showEvidence && (
            <EvidenceTable evidence={h.evidence} caption={`Evidence for ${hintName(h.code)}`} />
          )}
        </li>
      ))}
    </ol>
  );
}

/**
 * The hints beside the spectrum: choosing one highlights its evidence peaks on the chart
 * (and switches the chart to the spectrum the evidence was read from).
 */
export function HintsSidePanel({
  diagnosis,
  selected,
  onSelect,
}: {
  diagnosis: Diagnosis | null;
  selected: number | null;
  onSelect: (index: number | null, hint: DiagnosisHintItem | null) => void;
}) {
  const units = useUnits();
  return (
    <section aria-labelledby="hints-heading" className="flex flex-col gap-2">
      <h3 id="hints-heading" className="text-sm font-semibold text-ink">
        Diagnosis hints
      </h3>
      <p className="text-xs text-ink-muted">{HINTS_CAUTION}</p>
      {!diagnosis || diagnosis.hints.length === 0 ? (
        <HintList diagnosis={diagnosis} />
      ) : (
        <ol className="flex flex-col gap-2">
          {diagnosis.hints.map((h, i) => {
            const on = selected === i;
            return (
              <li key={`${h.code}-${i}`}>
                <button
                  type="button"
                  aria-pressed={on}
                  onClick={() => onSelect(on ? null : i, on ? null : h)}
                  className={cn(
                    'w-full rounded-md border px-3 py-2 text-left',
                    on
                      ? 'border-accent bg-accent-soft'
                      : 'border-line bg-surface hover:border-line-strong',
                  )}
                >
                  <span className="flex items-baseline justify-between gap-2">
                    <span className="text-sm font-semibold text-ink">{hintName(h.code)}</span>
                    <span className="font-mono text-xs text-ink-muted">
                      score {h.confidence.toFixed(2)}
                    </span>
                  </span>
                  <span className="mt-0.5 block text-xs text-ink">
                    {restateUnits(h.summary, units.system)}
                  </span>
                  <span className="mt-1 block text-xs font-medium text-accent">
                    {on ? 'Evidence marked on the chart' : 'Mark the evidence on the chart'}
                  </span>
                </button>
                {on && (
                  <EvidenceTable
                    evidence={h.evidence}
                    caption={`Evidence for ${hintName(h.code)}`}
                  />
                )}
              </li>
            );
          })}
        </ol>
      )}
      {diagnosis && diagnosis.notes.length > 0 && (
        <ul className="list-disc pl-4 text-xs text-ink-muted">
          {diagnosis.notes.map((n, i) => (
            <li key={i}>{n}</li>
          ))}
        </ul>
      )}
    </section>
  );
}
