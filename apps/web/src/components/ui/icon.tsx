/**
 * The pieces of the app's small outline marks (inline SVG, drawn in the text colour). Each
 * mark keeps its own `<svg>` and shape; these only carry the stroke settings they share.
 */

/** A stroked line or outline with rounded ends and joins. */
export function StrokePath({ d, width = 1.6 }: { d: string; width?: number }) {
  return (
    <path
      d={d}
      fill="none"
      stroke="currentColor"
      strokeWidth={width}
      strokeLinecap="round"
      strokeLinejoin="round"
    />
  );
}

/** A circle outline, dashed when `dash` is given; centred at (6, 6), a 12-unit mark's middle. */
export function Ring({
  r,
  width,
  dash,
  cx = 6,
  cy = cx,
}: {
  r: number;
  width: number;
  dash?: string;
  cx?: number;
  cy?: number;
}) {
  return (
    <circle
      cx={cx}
      cy={cy}
      r={r}
      fill="none"
      stroke="currentColor"
      strokeWidth={width}
      strokeDasharray={dash}
    />
  );
}
