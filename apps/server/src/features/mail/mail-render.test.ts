import { describe, expect, it } from 'vitest';
import { renderAlertMail, nextHour } from './alert-mail.ts';
import { messageIdOf, outboxRetryDelayS } from './outbox-sender.ts';
import { sanitizeHtml } from '../mailbox/mailbox-service.ts';
import { SAFETY_CAUTION } from './mail-templates.ts';

const facts = {
  alertId: 7,
  kind: 'raised' as const,
  level: 'danger' as const,
  siteCode: 'MFP',
  siteName: 'Marlow & <Fen>',
  areaName: 'Intake',
  machineId: 3,
  machineName: 'Pump "P-1" <script>alert(1)</script>',
  pointId: 12,
  pointTag: 'MFP-P1-H',
  pointName: "Motor's DE",
  bandName: 'Overall <b>velocity</b>',
  unit: 'mm/s',
  value: 7.234,
  limit: 4.5,
  peak: 7.3,
  at: new Date('2026-11-30T02:17:00Z'),
  verdict: 'ok',
  suspect: false,
};

describe('alert mail rendering', () => {
  it('escapes every value in the HTML part and keeps the text part plain', () => {
    const m = renderAlertMail(facts, 'http://x.test/points/12');
    expect(m.html).not.toContain('<script>');
    expect(m.html).toContain('Pump &quot;P-1&quot; &lt;script&gt;alert(1)&lt;/script&gt;');
    expect(m.html).toContain('Overall &lt;b&gt;velocity&lt;/b&gt;');
    expect(m.html).toContain('Marlow &amp; &lt;Fen&gt;');
    expect(m.html).toContain('Motor&#39;s DE');
    expect(m.text).toContain('Pump "P-1" <script>alert(1)</script>');
    // Three significant digits (mail-templates num()): 7.234 → 7.23, 4.5 → 4.50.
    expect(m.text).toContain('7.23 mm/s against the danger level 4.50 mm/s');
    expect(m.text).toContain(SAFETY_CAUTION);
    expect(m.subject).toContain('Danger raised');
  });

  it('a cleared alert says the value is back below the level and names the highest value while it was open', () => {
    const m = renderAlertMail({ ...facts, kind: 'cleared', value: 2.1 }, 'http://x.test/points/12');
    expect(m.text).toContain(
      '2.10 mm/s, back below the danger level 4.50 mm/s (highest while open: 7.30 mm/s)',
    );
    expect(m.subject).toContain('Danger cleared');
  });

  // 1 in = 25.4 mm exactly (NIST SP 811 appendix B; 1959 agreement), by hand:
  // 7.234 / 25.4 = 0.28480 in/s, 4.5 / 25.4 = 0.17717 in/s, 6.4 / 25.4 = 0.25197 in/s;
  // 45 µm / 25.4 = 1.7717 mil. Acceleration stays in g.
  it('when the recipient reads imperial, the values are in in/s and mil, rounded by the one rule', () => {
    const m = renderAlertMail(facts, 'http://x.test/points/12', { unitSystem: 'imperial' });
    expect(m.text).toContain('0.285 in/s against the danger level 0.177 in/s');
    expect(m.subject).toContain('0.285 in/s');
    expect(m.text).not.toContain('mm/s');
    const d = renderAlertMail({ ...facts, unit: 'um', value: 45, limit: 45 }, 'x', {
      unitSystem: 'imperial',
    });
    expect(d.text).toContain('1.77 mil against the danger level 1.77 mil');
    const metric = renderAlertMail({ ...facts, unit: 'um', value: 45, limit: 45 }, 'x', {
      unitSystem: 'metric',
    });
    expect(metric.text).toContain('45.0 µm against');
    const topHint = {
      code: 'unbalance' as const,
      confidence: 0.9,
      summary: '1× dominant',
      evidence: [
        { hz: 24.72, order: 1, amplitude: 6.4, label: '1×', spectrum: 'velocity' as const },
        { hz: 148, order: 6, amplitude: 0.21, label: '6×', spectrum: 'acceleration' as const },
      ],
    };
    const h = renderAlertMail({ ...facts, topHint }, 'x', { unitSystem: 'imperial' });
    expect(h.text).toContain('1× 24.7 Hz (1.00×) 0.252 in/s RMS; 6× 148 Hz (6.00×) 0.210 g RMS');
  });

  it('names the top diagnosis hint with its evidence, keeps the safety caution, and escapes it', () => {
    const topHint = {
      code: 'unbalance' as const,
      confidence: 0.9,
      summary: '1× dominant <with> little harmonic content',
      evidence: [
        { hz: 24.72, order: 1, amplitude: 6.4, label: '1×', spectrum: 'velocity' as const },
        { hz: 49.45, order: 2, amplitude: 0.323, label: '2×', spectrum: 'velocity' as const },
      ],
    };
    const m = renderAlertMail({ ...facts, topHint }, 'http://x.test/points/12');
    expect(m.text).toContain('Likely cause (hint)');
    expect(m.text).toContain('Unbalance: 1× dominant <with> little harmonic content');
    // num() gives three significant digits (mail-templates).
    expect(m.text).toContain('1× 24.7 Hz (1.00×) 6.40 mm/s RMS; 2× 49.5 Hz (2.00×) 0.323 mm/s RMS');
    expect(m.text).toContain('a hint, not a verdict');
    expect(m.text).toContain(SAFETY_CAUTION);
    expect(m.html).toContain('1× dominant &lt;with&gt; little');
    expect(m.html).toContain('Unbalance');
    // A cleared alert names no cause.
    const cleared = renderAlertMail({ ...facts, kind: 'cleared', topHint }, 'http://x.test/p');
    expect(cleared.text).not.toContain('Likely cause');
  });
});

describe('outbox rules', () => {
  it('the Message-ID is the same on every attempt of one row and differs between rows', () => {
    const createdAt = new Date('2026-12-01T00:00:00Z');
    expect(messageIdOf({ id: 5, createdAt })).toBe(messageIdOf({ id: 5, createdAt }));
    expect(messageIdOf({ id: 5, createdAt })).not.toBe(messageIdOf({ id: 6, createdAt }));
    expect(messageIdOf({ id: 5, createdAt })).toMatch(/^<[^<>@\s]+@[^<>@\s]+>$/);
  });

  it('back-off doubles from 30 s and stops at one hour (common practice, no source)', () => {
    expect([1, 2, 3, 4, 8, 20].map(outboxRetryDelayS)).toEqual([30, 60, 120, 240, 3600, 3600]);
  });

  it('hourly rows wait for the next full hour (UTC)', () => {
    expect(nextHour(new Date('2026-12-01T10:59:59Z')).toISOString()).toBe(
      '2026-12-01T11:00:00.000Z',
    );
    expect(nextHour(new Date('2026-12-01T23:00:00Z')).toISOString()).toBe(
      '2026-12-02T00:00:00.000Z',
    );
  });
});

describe('mailbox HTML sanitising', () => {
  it('removes scripts, frames, event handlers and javascript: links, keeps ordinary markup', () => {
    const dirty =
      '<p onclick="steal()">Hi <a href="javascript:alert(1)">x</a> <a href="https://ok.test/">ok</a></p>' +
      '<script>alert(1)</script><iframe src="https://evil.test"></iframe><img src=x onerror=alert(1)>';
    const clean = sanitizeHtml(dirty);
    expect(clean).not.toMatch(/<script|<iframe|onclick|onerror|javascript:/i);
    expect(clean).toContain('<a href="https://ok.test/">ok</a>');
    expect(clean).toContain('<p>Hi');
  });

  it.each([
    // Payloads that got past the earlier pattern-based cleaner (OWASP XSS filter evasion
    // cheat sheet: slash as separator, entity-encoded scheme, tab inside the scheme).
    ['<img/onerror=alert(1) src=x>', /onerror|alert/i],
    ['<a href="jav&#x61;script:alert(1)">x</a>', /script:|alert|href/i],
    ['<a href="java\tscript:alert(1)">x</a>', /script:|alert|href/i],
    ['<a href="&#106;avascript:alert(1)">x</a>', /script:|alert|href/i],
    ['<svg><script>alert(1)</script></svg>', /<svg|script|alert/i],
    ['<math><mi xlink:href="javascript:alert(1)">x</mi></math>', /xlink|script:|alert/i],
    ['<p style="background:url(javascript:alert(1))">x</p>', /url\(|script:|alert/i],
    ['<div style="width: expression(alert(1))">x</div>', /expression|alert/i],
    [
      '<form action="https://evil.test"><button formaction="javascript:alert(1)">go</button></form>',
      /<form|formaction|script:/i,
    ],
    ['<meta http-equiv="refresh" content="0;url=https://evil.test">', /<meta|refresh/i],
    ['<<script>script>alert(1)<</script>/script>', /<script|<\/script/i],
  ])('neutralises %s', (dirty, bad) => {
    expect(sanitizeHtml(dirty)).not.toMatch(bad);
  });

  it('keeps an inline SVG picture (the alert mail trend) only as a cleaned data: image', () => {
    // <svg onload=alert(1)> in base64: the picture may stay, its handler may not.
    const out = sanitizeHtml('<img src="data:image/svg+xml;base64,PHN2ZyBvbmxvYWQ9YWxlcnQoMSk+">');
    const b64 = /src="data:image\/svg\+xml;base64,([^"]*)"/.exec(out)?.[1];
    const svg = b64 === undefined ? '' : Buffer.from(b64, 'base64').toString('utf8');
    expect(svg).not.toMatch(/onload|alert/i);
    expect(out.replace(/src="data:image\/svg\+xml;base64,[^"]*"/, '')).not.toMatch(/data:|src=/i);
  });

  it('keeps the inline styles our own mails use', () => {
    const ours = '<p style="font-size:18px;margin:0 0 12px;color:#555">Alert</p>';
    expect(sanitizeHtml(ours)).toBe(ours);
  });
});
