/**
 * A spectrum on a Hz or order axis (option: spectrum-option.ts). The window shown is the
 * caller's: wheel, drag, slider and the zoom keys report it through `onView`, and every new
 * option (a cursor set by a click, a marker switched on) is built on it, so nothing resets
 * the zoom. A click on the plot reports its x for the cursors.
 */
import { useEffect, useRef } from 'react';
import { formatValue } from './chart-theme.ts';
import { buildSpectrumOption, type SpectrumOptionInput } from './spectrum-option.ts';
import { useBuiltOption } from './use-built-option.ts';
import { useEChart } from './use-echart.ts';
import { useZoomKeys, ZoomKeys } from './zoom-keys.tsx';
import { ChartCanvas } from './chart-canvas.tsx';

export type {
  ChartMark,
  SpectrumCursors,
  SpectrumHighlight,
  SpectrumTrace,
} from './spectrum-option.ts';

export interface SpectrumChartProps extends SpectrumOptionInput {
  onView: (view: [number, number]) => void;
  onPick?: (x: number) => void;
  height?: number;
  ariaLabel: string;
}

interface ZoomState {
  startValue?: number;
  endValue?: number;
}

export function SpectrumChart({ onView, onPick, height, ariaLabel, ...input }: SpectrumChartProps) {
  // Rebuilt only when an input changes, so a re-render keeps the window shown.
  const option = useBuiltOption(buildSpectrumOption, input);
  // The latest handlers, for the listeners registered once at mount.
  const handlersRef = useRef({ onView, onPick });
  useEffect(() => {
    handlersRef.current = { onView, onPick };
  });
  const { ref, chart } = useEChart(option, (chart) => {
    const zr = chart.getZr();
    const onClick = (e: { offsetX: number; offsetY: number }) => {
      if (!chart.containPixel({ gridIndex: 0 }, [e.offsetX, e.offsetY])) return;
      const [x] = chart.convertFromPixel({ gridIndex: 0 }, [e.offsetX, e.offsetY]) as number[];
      if (x !== undefined && x > 0) handlersRef.current.onPick?.(x);
    };
    // Whatever moved the window (wheel, drag, slider, zoom keys): read it back in axis values.
    const onZoom = () => {
      const dz = (chart.getOption().dataZoom as ZoomState[] | undefined)?.[0];
      if (typeof dz?.startValue === 'number' && typeof dz.endValue === 'number')
        handlersRef.current.onView([dz.startValue, dz.endValue]);
    };
    zr.on('click', onClick);
    chart.on('datazoom', onZoom);
    return () => {
      zr.off('click', onClick);
      chart.off('datazoom', onZoom);
    };
  });
  const zoom = useZoomKeys(chart, option);
  const xUnit = input.axis === 'hz' ? 'Hz' : 'order';
  return (
    <div>
      <ChartCanvas
        canvasRef={ref}
        ariaLabel={ariaLabel}
        height={height ?? (input.difference ? 440 : 360)}
        className="w-full cursor-crosshair"
      />
      <div className="mt-2 px-2">
        <ZoomKeys {...zoom} label="spectrum" format={(v) => `${formatValue(v, 4)} ${xUnit}`} />
      </div>
    </div>
  );
}
