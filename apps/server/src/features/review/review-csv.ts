/**
 * The weekly review as CSV: one section per table, each a title row, a header row and its
 * rows, sections separated by a blank line (RFC 4180 quoting by papaparse). Text cells that
 * a spreadsheet would run as a formula are prefixed with ' (OWASP "CSV injection").
 */
import Papa from 'papaparse';
import type { WeeklyReview } from '@turnstone/contracts/review';
import { displayUnit, toDisplay, type UnitSystem } from '@turnstone/contracts/units';

type Cell = string | number | boolean | null | undefined;

/**
 * Neutralises =, +, -, @, tab and CR at the start of a text cell (OWASP CSV injection), and
 * their full-width forms (＝ ＋ － ＠), which spreadsheet programs may read as the same.
 */
export function safeCell(v: Cell): string | number {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? Number(v.toPrecision(6)) : '';
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  return /^[=+\-@\t\r\uFF1D\uFF0B\uFF0D\uFF20]/.test(v) ? `'${v}` : v;
}

function section(title: string, header: string[], rows: Cell[][]): string {
  return Papa.unparse([[title], header, ...rows.map((r) => r.map(safeCell))], {
    newline: '\r\n',
  });
}

/** The review as CSV, values and unit columns in the reader's unit system (stored metric). */
export function reviewCsv(r: WeeklyReview, system: UnitSystem = 'metric'): string {
  const v = (value: number | null, unit: string) =>
    value === null ? null : toDisplay(value, unit, system);
  const u = (unit: string) => displayUnit(unit, system);
  const sites = r.sites.map((s) => s.code).join(' ');
  const parts = [
    Papa.unparse(
      [
        ['Turnstone weekly review'],
        ['week ending', r.period.weekEnding, 'days in UTC'],
        ['sites', sites],
        ['generated at', r.period.generatedAt],
        ['forecast horizon (weeks)', r.period.weeksAhead],
      ].map((row) => row.map(safeCell)),
      { newline: '\r\n' },
    ),
    section(
      'movers',
      [
        'site',
        'point',
        'point name',
        'machine',
        'band',
        'unit',
        'last week mean',
        'this week mean',
        'change',
        'change %',
        'values last week',
        'values this week',
      ],
      r.movers.map((m) => [
        m.siteCode,
        m.pointTag,
        m.pointName,
        m.machineName,
        m.bandName,
        u(m.unit),
        v(m.lastWeekMean, m.unit),
        v(m.thisWeekMean, m.unit),
        v(m.change, m.unit),
        m.changePercent,
        m.lastWeekCount,
        m.thisWeekCount,
      ]),
    ),
    section(
      'forecasts',
      [
        'site',
        'point',
        'point name',
        'machine',
        'band',
        'unit',
        'latest value',
        'latest at',
        'target level',
        'target value',
        'level source',
        'crossing at',
        'days to crossing',
        'model',
        'R2',
        'daily means fitted',
      ],
      r.forecasts.map((f) => [
        f.siteCode,
        f.pointTag,
        f.pointName,
        f.machineName,
        f.bandName,
        u(f.unit),
        v(f.latestValue, f.unit),
        f.latestAt,
        f.target.level,
        v(f.target.value, f.unit),
        f.levelSource,
        f.crossingAt,
        f.daysToCrossing,
        f.model,
        f.r2,
        f.points,
      ]),
    ),
    section(
      'open alerts',
      [
        'site',
        'point',
        'point name',
        'machine',
        'band',
        'unit',
        'level',
        'state',
        'limit',
        'last value',
        'peak value',
        'first at',
        'age days',
        'suspect data',
      ],
      r.openAlerts.map((a) => [
        a.siteCode,
        a.pointTag,
        a.pointName,
        a.machineName,
        a.bandName,
        u(a.unit),
        a.level,
        a.state,
        v(a.limitValue, a.unit),
        v(a.lastValue, a.unit),
        v(a.peakValue, a.unit),
        a.firstAt,
        a.ageDays,
        a.suspect,
      ]),
    ),
    section(
      'quality notices',
      ['site', 'point', 'point name', 'machine', 'taken at', 'verdict', 'findings'],
      r.qualityNotices.map((q) => [
        q.siteCode,
        q.pointTag,
        q.pointName,
        q.machineName,
        q.takenAt,
        q.verdict,
        q.findings.map((f) => f.message).join('; '),
      ]),
    ),
    section(
      'findings due',
      ['site', 'point', 'machine', 'title', 'state', 'work order', 'due date', 'overdue', 'note'],
      r.findingsDue.map((f) => [
        f.siteCode,
        f.pointTag,
        f.machineName,
        f.title,
        f.state,
        f.workOrderRef,
        f.dueDate,
        f.overdue,
        f.note,
      ]),
    ),
  ];
  return parts.join('\r\n\r\n') + '\r\n';
}
