import { formatQuantity } from '@turnstone/contracts/number-format';
import type { UnitSystem } from '@turnstone/contracts/units';
import type { AlertDetail, AlertStateName } from '@turnstone/contracts/alerts';
import { Ring, StrokePath } from '../../../components/ui/icon.tsx';
import { cn } from '../../../lib/cn.ts';

export const alertStateLabels: Record<AlertStateName, string> = {
  raised: 'Raised',
  acknowledged: 'Acknowledged',
  cleared: 'Cleared',
};

export const alertEventLabels = {
  raised: 'Raised',
  escalated: 'Escalated to danger',
  acknowledged: 'Acknowledged',
  cleared: 'Cleared',
} as const;

/** A value with its unit in a unit system, by the app's one number rule. */
export function formatLevel(value: number, unit: string, system: UnitSystem = 'metric'): string {
  return formatQuantity(value, unit, system);
}

/** Hours as people say them: "5 days", "12 hours". */
function formatHours(hours: number): string {
  if (hours >= 24 && hours % 24 === 0) return hours === 24 ? '1 day' : `${hours / 24} days`;
  return hours === 1 ? '1 hour' : `${hours} hours`;
}

/**
 * The alert's state in plain sentences, from its history and the band's clear rule: what
 * raised it against which level, an escalation after an acknowledgement, why it is still open
 * while the latest value is below the level, and what clears it.
 */
export function alertStateSentences(a: AlertDetail, system: UnitSystem = 'metric'): string[] {
  const f = (v: number) => formatLevel(v, a.unit, system);
  const out: string[] = [];
  // How long ago, counted in the band's values (the unit its clear rule counts in too).
  const n = a.valuesSinceRaised;
  const ago =
    n === null || n === undefined
      ? ''
      : n === 0
        ? ' by the latest value'
        : ` ${n} value${n === 1 ? '' : 's'} ago`;
  const raised = a.history.find((h) => h.kind === 'raised');
  const escalated = a.history.findLast((h) => h.kind === 'escalated');
  if (a.state === 'cleared') {
    const cleared = a.history.findLast((h) => h.kind === 'cleared');
    out.push(
      `Raised${raised?.value != null ? ` at ${f(raised.value)}` : ''} against the ${a.level} level ${f(a.limit)}; cleared${cleared?.value != null ? ` at ${f(cleared.value)}` : ''}${a.clearRule ? `, below the clear level ${f(a.clearRule.clearLevel)}` : ''}.`,
    );
    return out;
  }
  if (escalated && raised && raised.level === 'alert') {
    out.push(
      `Raised${ago}${raised.value !== null ? ` at ${f(raised.value)}` : ''} against the alert level${a.clearRule ? ` ${f(a.clearRule.alertLevel)}` : ''}; escalated to danger${escalated.value !== null ? ` at ${f(escalated.value)}` : ''} against the danger level ${f(a.limit)}.`,
    );
  } else {
    const at = raised?.value ?? null;
    out.push(
      `Raised${ago}${at !== null ? ` at ${f(at)}` : ''} against the ${a.level} level ${f(a.limit)}.`,
    );
  }
  // Written in the order things happened (event ids), not by the capture time an
  // escalation carries, which may precede an acknowledgement made while it was in transit.
  const ackBeforeEscalation =
    escalated !== undefined &&
    a.history.some((h) => h.kind === 'acknowledged' && h.id < escalated.id);
  if (ackBeforeEscalation && a.state === 'raised')
    out.push('Escalated to danger after it was acknowledged; acknowledge again.');
  const rule = a.clearRule;
  if (rule) {
    if (a.value < rule.alertLevel && a.value >= rule.clearLevel)
      out.push(
        `The latest value, ${f(a.value)}, is below the alert level ${f(rule.alertLevel)} but not below the clear level ${f(rule.clearLevel)}, so the alert stays open.`,
      );
    const n = rule.clearPersistence;
    out.push(
      `It clears when ${n === 1 ? 'a value falls' : `${n} values in a row fall`} below ${f(rule.clearLevel)}${rule.clearAfterHours > 0 ? `, once ${formatHours(rule.clearAfterHours)} ${rule.clearAfterHours === 1 || rule.clearAfterHours === 24 ? 'has' : 'have'} passed without the alert level ${f(rule.alertLevel)} being reached again` : ''}.`,
    );
  }
  return out;
}

/** ISO 20816 zones in plain words (ISO 20816-3 zone definitions, paraphrased). */
export const isoZoneMeanings = {
  A: 'as newly commissioned machines',
  B: 'fit for unrestricted long-term operation',
  C: 'unsatisfactory for long-term continuous operation',
  D: 'severe enough to damage the machine',
} as const;

/** The lifecycle state as text and a shape (filled: raised; ring with tick: acknowledged; hollow: cleared). */
export function AlertStateMark({
  state,
  className,
}: {
  state: AlertStateName;
  className?: string;
}) {
  return (
    <span
      className={cn('inline-flex items-center gap-1.5 whitespace-nowrap text-[13px]', className)}
    >
      <svg viewBox="0 0 12 12" aria-hidden="true" className="size-3 shrink-0 text-ink-muted">
        {state === 'raised' && <circle cx="6" cy="6" r="4.5" fill="currentColor" />}
        {state === 'acknowledged' && (
          <>
            <Ring r={4.6} width={1.4} />
            <StrokePath d="M3.8 6.1 5.3 7.6 8.3 4.5" width={1.4} />
          </>
        )}
        {state === 'cleared' && <Ring r={4.4} width={1.2} dash="2 1.5" />}
      </svg>
      <span className={state === 'cleared' ? 'text-ink-muted' : 'text-ink'}>
        {alertStateLabels[state]}
      </span>
    </span>
  );
}
