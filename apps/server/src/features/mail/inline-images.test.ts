import { describe, expect, it } from 'vitest';
import { embedInlineParts, safeImageSrc, sanitizeSvg } from './inline-images.ts';

const b64 = (s: string) => Buffer.from(s, 'utf8').toString('base64');
const unb64 = (s: string) => Buffer.from(s, 'base64').toString('utf8');

// Content-ID references per RFC 2392 (cid: URL = the part's Content-ID without < >).
describe('inline pictures of received mail', () => {
  it('replaces cid: references by data: URIs of the picture parts, leaves others', () => {
    const svg = '<svg xmlns="http://www.w3.org/2000/svg"><rect width="4" height="2"/></svg>';
    const html =
      '<img src="cid:trend@turnstone" alt="trend"><img src="cid:other@x" alt="missing"><img src=\'cid:exe@x\'>';
    const out = embedInlineParts(html, [
      { cid: '<trend@turnstone>', contentType: 'image/svg+xml', content: Buffer.from(svg) },
      { cid: 'exe@x', contentType: 'application/octet-stream', content: Buffer.from('MZ') },
    ]);
    expect(out).toBe(
      `<img src="data:image/svg+xml;base64,${b64(svg)}" alt="trend"><img src="cid:other@x" alt="missing"><img src='cid:exe@x'>`,
    );
  });

  it('an SVG keeps its shapes and text and loses scripts, handlers, links and outside references', () => {
    // Attack forms from the OWASP XSS filter evasion cheat sheet (SVG section), from memory.
    const hostile = `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 10 10" onload="alert(1)">
      <script>alert(2)</script>
      <clipPath id="c"><rect width="10" height="10"/></clipPath>
      <g clip-path="url(#c)"><path d="M0 0L10 10" stroke="#123456" stroke-width="2"/></g>
      <rect width="1" height="1" onclick="alert(3)" fill="url(https://evil.example/p#x)"/>
      <foreignObject><div xmlns="http://www.w3.org/1999/xhtml">html</div></foreignObject>
      <image href="https://evil.example/x.png"/>
      <a href="javascript:alert(4)"><text x="1" y="9">4.50 mm/s</text></a>
      <text x="1" y="5" style="fill:#333;font-size:4px">Alert</text>
    </svg>`;
    const clean = sanitizeSvg(hostile);
    for (const gone of [
      'script',
      'onload',
      'onclick',
      'foreignObject',
      'image',
      'evil',
      'javascript',
      '<a',
    ])
      expect(clean, gone).not.toContain(gone);
    expect(clean).toContain('viewBox="0 0 10 10"');
    expect(clean).toContain('<clipPath id="c">');
    expect(clean).toContain('clip-path="url(#c)"');
    expect(clean).toContain('<path d="M0 0L10 10" stroke="#123456" stroke-width="2"');
    expect(clean).toContain('4.50 mm/s');
    expect(clean).toContain('>Alert</text>');
  });

  it('shows data: images of picture types only, SVG re-encoded clean; drops every other source', () => {
    const svg =
      '<svg xmlns="http://www.w3.org/2000/svg"><script>x()</script><rect width="1"/></svg>';
    const out = safeImageSrc(`data:image/svg+xml;base64,${b64(svg)}`)!;
    expect(out.startsWith('data:image/svg+xml;base64,')).toBe(true);
    expect(unb64(out.split(',')[1]!)).not.toContain('script');
    expect(unb64(out.split(',')[1]!)).toContain('<rect width="1"');
    expect(safeImageSrc('data:image/png;base64,iVBORw0KGgo=')).toBe(
      'data:image/png;base64,iVBORw0KGgo=',
    );
    expect(safeImageSrc('cid:trend@turnstone')).toBe('cid:trend@turnstone');
    for (const bad of [
      'https://tracker.example/pixel.gif',
      'data:text/html;base64,PHNjcmlwdD4=',
      'data:image/svg+xml,<svg onload=alert(1)>',
      'javascript:alert(1)',
      undefined,
    ])
      expect(safeImageSrc(bad), String(bad)).toBeUndefined();
  });
});
