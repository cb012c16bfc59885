/**
 * The weekly review as files for a spreadsheet: one CSV file per table (RFC 4180 quoting by
 * papaparse), each a single header row and its rows so a spreadsheet's filter works on it,
 * packed in one ZIP (fflate). Instants are ISO 8601 UTC (`2026-11-27T14:05:00.000Z`), days
 * ISO 8601 dates; every row names its site and the site's time zone. Text cells that a
 * spreadsheet would run as a formula are prefixed with ' (OWASP "CSV injection").
 */
import Papa from 'papaparse';
import { strToU8, zipSync } from 'fflate';
import type { Finding } from '@turnstone/contracts/findings';
import type { WeeklyReview } from '@turnstone/contracts/review';
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

export interface CsvFile {
  name: string;
  text: string;
}

/** A table as CSV text: one header row, then the rows (CRLF line ends, UTF-8 with BOM). */
export function csvTable(header: string[], rows: Cell[][]): string {
  // The byte-order mark makes spreadsheet programs read UTF-8 (µm, –) as UTF-8.
  return (
    '\uFEFF' +
    Papa.unparse([header, ...rows.map((r) => r.map(safeCell))], { newline: '\r\n' }) +
    '\r\n'
  );
}

const findingHeader = [
  'site',
  'point',
  'machine',
  'title',
  'state',
  'priority',
  'owner',
  'planned downtime h',
  'work order',
  'due date',
  'created at',
  'created by',
  'updated at',
  'note',
];
const findingRow = (f: Finding): Cell[] => [
  f.siteCode,
  f.pointTag,
  f.machineName,
  f.title,
  f.state,
  f.priority,
  f.owner,
  f.plannedDowntimeHours,
  f.workOrderRef,
  f.dueDate,
  f.createdAt,
  f.createdBy.name,
  f.updatedAt,
  f.note,
];

/** The band a forecast or an open alert is about: the columns those tables start with. */
interface BandPlace {
  siteCode: string;
  machineName: string;
  pointTag: string;
  pointName: string;
  bandName: string;
  unit: string;
}
const bandPlaceHeader = ['site', 'machine', 'point', 'point name', 'band', 'unit'];
const bandPlaceRow = (b: BandPlace): Cell[] => [
  b.siteCode,
  b.machineName,
  b.pointTag,
  b.pointName,
  b.bandName,
  b.unit,
];

/** The review's tables, one file each; `summary.csv` states the weeks and the noise threshold. */
export function reviewCsvFiles(r: WeeklyReview): CsvFile[] {
  const zoneOf = new Map(r.siteWeeks.map((w) => [w.siteCode, w.timeZone]));
  const critOf = new Map(r.machineGroups.map((g) => [g.machineId, g.criticality]));
  const s = r.summary;
  return [
    {
      name: 'summary.csv',
      text: csvTable(
        ['item', 'value'],
        [
          ['week ending', r.period.weekEnding],
          ...r.siteWeeks.flatMap((w): Cell[][] => [
            [`${w.siteCode} time zone`, w.timeZone],
            [`${w.siteCode} this week from`, w.thisWeek.from],
            [`${w.siteCode} this week to (exclusive)`, w.thisWeek.to],
            [`${w.siteCode} last week from`, w.lastWeek.from],
          ]),
          ['generated at', r.period.generatedAt],
          ['forecast horizon weeks', r.period.weeksAhead],
          ['noise threshold: minimum rise %', r.noise.minChangePercent],
          ['noise threshold: minimum values per week', r.noise.minValues],
          ['rising bands', s.movers],
          ['rises below the noise threshold', s.moversBelowThreshold],
          ['forecasts', s.forecasts],
          ['open alerts', s.openAlerts],
          ['open danger alerts', s.openDanger],
          ['not acknowledged', s.unacknowledged],
          ['quality notices', s.qualityNotices],
          ['findings due', s.findingsDue],
          ['findings overdue', s.findingsOverdue],
          ['findings created this week', s.findingsCreated],
        ],
      ),
    },
    {
      name: 'rising-bands.csv',
      text: csvTable(
        [
          'site',
          'time zone',
          'machine',
          'criticality',
          'point',
          'point name',
          'band',
          'unit',
          'last week mean',
          'values last week',
          'this week mean',
          'values this week',
          'change',
          'change %',
        ],
        r.movers.map((m) => [
          m.siteCode,
          zoneOf.get(m.siteCode),
          m.machineName,
          critOf.get(m.machineId),
          m.pointTag,
          m.pointName,
          m.bandName,
          m.unit,
          m.lastWeekMean,
          m.lastWeekCount,
          m.thisWeekMean,
          m.thisWeekCount,
          m.change,
          m.changePercent,
        ]),
      ),
    },
    {
      name: 'forecasts.csv',
      text: csvTable(
        [
          ...bandPlaceHeader,
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
          ...bandPlaceRow(f),
          f.latestValue,
          f.latestAt,
          f.target.level,
          f.target.value,
          f.levelSource,
          f.crossingAt,
          f.daysToCrossing,
          f.model,
          f.r2,
          f.points,
        ]),
      ),
    },
    {
      name: 'open-alerts.csv',
      text: csvTable(
        [
          ...bandPlaceHeader,
          'level',
          'state',
          'limit',
          'last value',
          'highest while open',
          'first at',
          'age days',
          'suspect data',
        ],
        r.openAlerts.map((a) => [
          ...bandPlaceRow(a),
          a.level,
          a.state,
          a.limitValue,
          a.lastValue,
          a.peakValue,
          a.firstAt,
          a.ageDays,
          a.suspect,
        ]),
      ),
    },
    {
      name: 'quality-notices.csv',
      text: csvTable(
        ['site', 'machine', 'point', 'point name', 'taken at', 'verdict', 'checks'],
        r.qualityNotices.map((q) => [
          q.siteCode,
          q.machineName,
          q.pointTag,
          q.pointName,
          q.takenAt,
          q.verdict,
          q.findings.map((f) => f.message).join('; '),
        ]),
      ),
    },
    {
      name: 'findings-due.csv',
      text: csvTable(
        [...findingHeader, 'overdue'],
        r.findingsDue.map((f) => [...findingRow(f), f.overdue]),
      ),
    },
    {
      name: 'findings-created-this-week.csv',
      text: csvTable(findingHeader, r.findingsCreated.map(findingRow)),
    },
  ];
}

/** The files in one ZIP archive, each named after the review's week. */
export function reviewZip(r: WeeklyReview): Uint8Array {
  const files: Record<string, Uint8Array> = {};
  for (const f of reviewCsvFiles(r)) files[f.name] = strToU8(f.text);
  return zipSync(files, { level: 6, mtime: new Date(r.period.generatedAt) });
}
