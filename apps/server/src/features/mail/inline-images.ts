/**
 * Inline pictures of received mail (the alert mail's trend picture travels as a CID
 * attachment): the local SMTP fake keeps them inside the stored HTML as data: URIs, and the
 * Mailbox shows them only after `safeImageSrc` has checked them.
 */
import sanitize from 'sanitize-html';

/** The picture types kept; anything else stays a `cid:` reference (its alt text shows). */
const KEPT_TYPES = new Set(['image/svg+xml', 'image/png', 'image/jpeg', 'image/gif']);
const MAX_INLINE_BYTES = 512 * 1024;

export interface InlinePart {
  cid?: string | undefined;
  contentType: string;
  content: Buffer;
}

/**
 * `cid:` references of `html` replaced by data: URIs of the message's inline parts (by
 * Content-ID, RFC 2392); references to parts not kept are left as they are.
 */
export function embedInlineParts(html: string, parts: readonly InlinePart[]): string {
  const byCid = new Map<string, InlinePart>();
  for (const p of parts) {
    const type = p.contentType.toLowerCase().split(';')[0]!.trim();
    if (p.cid && KEPT_TYPES.has(type) && p.content.length <= MAX_INLINE_BYTES)
      byCid.set(p.cid.replace(/^<|>$/g, ''), { ...p, contentType: type });
  }
  if (byCid.size === 0) return html;
  return html.replace(/(["'])cid:([^"']+)\1/gi, (whole, quote: string, cid: string) => {
    const part = byCid.get(decodeURIComponent(cid));
    return part
      ? `${quote}data:${part.contentType};base64,${part.content.toString('base64')}${quote}`
      : whole;
  });
}

/** What an SVG picture may hold: shapes, text, groups, clips, gradients; nothing active. */
const SVG_TAGS = [
  'svg',
  'g',
  'defs',
  'clipPath',
  'linearGradient',
  'radialGradient',
  'stop',
  'path',
  'rect',
  'circle',
  'ellipse',
  'line',
  'polyline',
  'polygon',
  'text',
  'tspan',
  'title',
  'desc',
];
const SVG_ATTRIBUTES = [
  'xmlns',
  'version',
  'width',
  'height',
  'viewBox',
  'preserveAspectRatio',
  'x',
  'y',
  'x1',
  'y1',
  'x2',
  'y2',
  'cx',
  'cy',
  'r',
  'rx',
  'ry',
  'd',
  'points',
  'transform',
  'fill',
  'fill-opacity',
  'fill-rule',
  'stroke',
  'stroke-width',
  'stroke-opacity',
  'stroke-dasharray',
  'stroke-dashoffset',
  'stroke-linecap',
  'stroke-linejoin',
  'stroke-miterlimit',
  'opacity',
  'clip-path',
  'clip-rule',
  'id',
  'class',
  'font-family',
  'font-size',
  'font-weight',
  'font-style',
  'text-anchor',
  'dominant-baseline',
  'alignment-baseline',
  'dx',
  'dy',
  'offset',
  'stop-color',
  'stop-opacity',
  'gradientUnits',
  'gradientTransform',
  'paint-order',
  'style',
];
/** A paint or clip may name an element of the picture itself (`url(#c1)`), nothing outside. */
const LOCAL_REF = /^[-#%.,\w\s()/'"]*$/;

/** An SVG document reduced to the allow-list above (no scripts, handlers, links or foreign content). */
export function sanitizeSvg(svg: string): string {
  return sanitize(svg, {
    allowedTags: SVG_TAGS,
    allowedAttributes: { '*': SVG_ATTRIBUTES },
    allowedStyles: { '*': Object.fromEntries(SVG_ATTRIBUTES.map((a) => [a, [LOCAL_REF]])) },
    parser: { xmlMode: true, lowerCaseTags: false, lowerCaseAttributeNames: false },
    disallowedTagsMode: 'discard',
    exclusiveFilter: (frame) =>
      Object.values(frame.attribs).some(
        (v) => /url\(\s*['"]?(?!#)/i.test(v) || /javascript:/i.test(v),
      ),
  });
}

/**
 * An `<img>` source as the Mailbox may show it: `cid:` as it is (shows the alt text), a
 * base64 data: URI of PNG, JPEG or GIF as it is, of SVG re-encoded after `sanitizeSvg`;
 * anything else (http, other data types, unparsable) removed.
 */
export function safeImageSrc(src: string | undefined): string | undefined {
  if (!src) return undefined;
  if (/^cid:/i.test(src)) return src;
  const m = /^data:(image\/(?:svg\+xml|png|jpeg|gif));base64,([A-Za-z0-9+/=\s]+)$/i.exec(src);
  if (!m) return undefined;
  const type = m[1]!.toLowerCase();
  if (type !== 'image/svg+xml') return `data:${type};base64,${m[2]!.replace(/\s/g, '')}`;
  const clean = sanitizeSvg(Buffer.from(m[2]!, 'base64').toString('utf8'));
  return `data:image/svg+xml;base64,${Buffer.from(clean, 'utf8').toString('base64')}`;
}
