/**
 * A horizontal line across an inline SVG, in a colour and dash pattern: a sparkline's alert
 * and danger levels, a spectrum marker key's swatch.
 */
export function LevelLine({
  y,
  width,
  colour,
  dash,
  thickness = 1,
}: {
  y: number;
  width: number;
  colour: string;
  dash?: string;
  thickness?: number;
}) {
  return (
    <path d={`M0 ${y}H${width}`} stroke={colour} strokeDasharray={dash} strokeWidth={thickness} />
  );
}
