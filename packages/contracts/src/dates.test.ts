/**
 * The shared dates against Python's zoneinfo (the IANA tz database) and datetime.isocalendar,
 * run live (Debian python3), for zones with awkward clock changes.
 */
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import {
  dayStart,
  formatDateTime,
  isoWeekDays,
  isoWeekOf,
  localDate,
  offsetSegments,
  wallTimeInstant,
} from './dates.ts';

function python(code: string): string {
  return execFileSync('python3', ['-c', code], { encoding: 'utf8' }).trim();
}

const CASES: [string, string][] = [
  ['Europe/London', '2026-03-29'], // clocks forward at 01:00 UTC
  ['Europe/London', '2026-10-25'], // clocks back: a 25-hour day
  ['Europe/Berlin', '2026-11-30'],
  ['America/Santiago', '2026-09-06'], // DST begins at local midnight: 00:00 does not exist
  ['Asia/Kolkata', '2026-12-01'], // UTC+05:30
  ['Pacific/Chatham', '2026-04-05'], // UTC+13:45 → +12:45
  ['America/St_Johns', '2026-11-01'], // UTC−02:30 → −03:30
  ['UTC', '2026-12-31'],
];

describe('site days against zoneinfo (tz database), run live', () => {
  it('the first instant of each day, and the day length across clock changes', () => {
    const code = `
from datetime import datetime, date, timedelta, timezone
from zoneinfo import ZoneInfo
cases = ${JSON.stringify(CASES)}
out = []
for tz, d in cases:
    z = ZoneInfo(tz)
    y, m, dd = map(int, d.split('-'))
    # first UTC minute whose local date is d (zoneinfo's own conversion)
    t = datetime(y, m, dd, tzinfo=timezone.utc) - timedelta(hours=15)
    while t.astimezone(z).date() < date(y, m, dd):
        t += timedelta(minutes=1)
    n = t + timedelta(hours=20)
    while n.astimezone(z).date() <= date(y, m, dd):
        n += timedelta(minutes=1)
    out.append(f"{int(t.timestamp()*1000)} {int(n.timestamp()*1000)}")
print("\\n".join(out))`;
    const lines = python(code).split('\n');
    CASES.forEach(([tz, d], i) => {
      const [start, next] = lines[i]!.split(' ').map(Number);
      expect(dayStart(d, tz), `${tz} ${d}`).toBe(start);
      const nextDay = new Date(Date.parse(`${d}T00:00:00Z`) + 86_400_000)
        .toISOString()
        .slice(0, 10);
      expect(dayStart(nextDay, tz), `${tz} day after ${d}`).toBe(next);
      expect(localDate(start!, tz)).toBe(d);
      expect(localDate(start! - 60_000, tz) < d).toBe(true);
    });
  });

  it('offset segments find London’s 2026 clock changes to the minute', () => {
    const from = Date.parse('2026-03-01T00:00:00Z');
    const to = Date.parse('2026-11-01T00:00:00Z');
    const segs = offsetSegments('Europe/London', from, to);
    // tz database (zoneinfo run live): the UTC instants of the changes.
    const [fwd, back] = python(`
from datetime import datetime, timedelta, timezone
from zoneinfo import ZoneInfo
z = ZoneInfo('Europe/London'); t = datetime(2026,3,1,tzinfo=timezone.utc); out=[]; prev = t.astimezone(z).utcoffset()
while t < datetime(2026,11,1,tzinfo=timezone.utc):
    o = t.astimezone(z).utcoffset()
    if o != prev: out.append(int(t.timestamp()*1000)); prev = o
    t += timedelta(minutes=15)
print(out[0], out[1])`)
      .split(' ')
      .map(Number);
    expect(segs).toEqual([
      { until: fwd, offset: 0 },
      { until: back, offset: 60 },
      { until: to, offset: 0 },
    ]);
  });

  it('ISO weeks agree with Python’s date.isocalendar over year ends', () => {
    const days = Array.from({ length: 40 }, (_, i) =>
      new Date(Date.UTC(2020, 11, 20) + i * 7 * 86_400_000 + (i % 7) * 86_400_000)
        .toISOString()
        .slice(0, 10),
    ).concat(['2026-12-28', '2027-01-03', '2027-01-04', '2020-12-31', '2021-01-03']);
    const weeks = python(`
from datetime import date
ds = ${JSON.stringify(days)}
print(" ".join("%d-W%02d" % date.fromisoformat(d).isocalendar()[:2] for d in ds))`).split(' ');
    days.forEach((d, i) => expect(isoWeekOf(d), d).toBe(weeks[i]));
    expect(isoWeekDays('2026-W53')).toEqual({ monday: '2026-12-28', sunday: '2027-01-03' });
    expect(isoWeekDays('2027-W53')).toBeNull(); // 2027 has 52 ISO weeks (isocalendar of 2027-12-31 is week 52)
    expect(isoWeekDays('2026-W49')).toEqual({ monday: '2026-11-30', sunday: '2026-12-06' });
  });

  it('one display format: YYYY-MM-DD HH:mm in the zone asked for', () => {
    expect(formatDateTime('2026-07-01T11:05:00Z', 'Europe/London')).toBe('2026-07-01 12:05');
    expect(formatDateTime('2026-07-01T23:30:00Z', 'Asia/Kolkata')).toBe('2026-07-02 05:00');
    expect(formatDateTime('2026-07-01T00:00:00Z')).toBe('2026-07-01 00:00');
  });
});

describe('a wall-clock reading in a site zone against zoneinfo (fold=0), run live', () => {
  const WALLS: [string, string][] = [
    ['Europe/London', '2026-07-01T12:05'], // summer time, UTC+1
    ['Europe/London', '2026-03-29T01:30'], // skipped by the clock change
    ['Europe/London', '2026-10-25T01:30'], // occurs twice
    ['America/Santiago', '2026-09-06T00:00'], // skipped: DST begins at midnight
    ['Asia/Kolkata', '2026-12-01T09:15:30'],
    ['Pacific/Chatham', '2026-04-05T02:50'], // occurs twice (+13:45 → +12:45)
    ['America/St_Johns', '2026-11-01T00:45'], // occurs twice (−02:30 → −03:30)
    ['UTC', '2026-12-31T23:59'],
  ];
  it('gives the instant zoneinfo gives', () => {
    const code = `
from datetime import datetime
from zoneinfo import ZoneInfo
for tz, w in ${JSON.stringify(WALLS)}:
    print(int(datetime.fromisoformat(w).replace(tzinfo=ZoneInfo(tz)).timestamp() * 1000))`;
    const lines = python(code).split('\n').map(Number);
    WALLS.forEach(([tz, w], i) => expect(wallTimeInstant(w, tz), `${tz} ${w}`).toBe(lines[i]));
  });
  it('refuses what is not a reading', () => {
    expect(wallTimeInstant('2026-02-30T10:00', 'UTC')).toBeNull();
    expect(wallTimeInstant('yesterday', 'UTC')).toBeNull();
    expect(wallTimeInstant('', 'Europe/London')).toBeNull();
  });
});
