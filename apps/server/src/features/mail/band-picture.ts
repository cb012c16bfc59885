/**
 * The small picture every alert mail carries: the band's recent values with its alert and
 * danger levels, drawn on the server with ECharts' server-side SVG renderer (no DOM, no
 * browser). People read a picture faster than a number.
 *
 * It travels as an SVG image: the HTML body holds it as a data URL and the sender hands it
 * to nodemailer with `attachDataUrls`, which turns it into an inline (CID) attachment.
 * Mail clients that block SVG show the image's alt text, which names the values.
 */
import * as echarts from 'echarts';
import { formatNumber } from '@turnstone/contracts/number-format';

export interface BandPictureInput {
  bandName: string;
  unit: string;
  values: readonly { at: Date; value: number }[];
  /** Levels drawn as dashed lines; null: not drawn. */
  alertLevel: number | null;
  dangerLevel: number | null;
}

export const PICTURE_WIDTH = 480;
export const PICTURE_HEIGHT = 160;

const INK = '#1f2328';
const MUTED = '#5b616b';
const LINE = '#1d5c63';
const ALERT = '#a35c00';
const DANGER = '#b3261e';

const fmt = (v: number) => formatNumber(v);
const day = (d: Date) => d.toISOString().slice(5, 10);

/** A level as a dashed line with its name and value. */
function level(value: number, name: string, color: string) {
  return {
    yAxis: value,
    name,
    lineStyle: { color, type: 'dashed' as const, width: 1.2 },
    label: {
      formatter: `${name} ${fmt(value)}`,
      color,
      fontSize: 10,
      position: name === 'alert' ? ('insideStartTop' as const) : ('insideEndTop' as const),
    },
  };
}

/** The picture as an SVG document (a string), or null when there are fewer than 2 values. */
export function renderBandPicture(input: BandPictureInput): string | null {
  if (input.values.length < 2) return null;
  const chart = echarts.init(null, null, {
    renderer: 'svg',
    ssr: true,
    width: PICTURE_WIDTH,
    height: PICTURE_HEIGHT,
  });
  try {
    const levels = [
      ...(input.alertLevel !== null ? [level(input.alertLevel, 'alert', ALERT)] : []),
      ...(input.dangerLevel !== null ? [level(input.dangerLevel, 'danger', DANGER)] : []),
    ];
    const top = Math.max(...levels.map((l) => l.yAxis), ...input.values.map((v) => v.value)) * 1.08;
    chart.setOption({
      animation: false,
      backgroundColor: '#fffdf8',
      textStyle: { fontFamily: 'sans-serif', color: INK },
      grid: { left: 44, right: 12, top: 22, bottom: 24 },
      title: {
        text: `${input.bandName}, last ${input.values.length} values (${input.unit})`,
        left: 4,
        top: 2,
        textStyle: { fontSize: 11, fontWeight: 'normal', color: MUTED },
      },
      xAxis: {
        type: 'time',
        axisLabel: { fontSize: 9, color: MUTED, formatter: (t: number) => day(new Date(t)) },
        splitLine: { show: false },
      },
      yAxis: {
        type: 'value',
        min: 0,
        max: Number(top.toPrecision(2)),
        axisLabel: { fontSize: 9, color: MUTED },
        splitLine: { lineStyle: { color: '#e7e1d4' } },
      },
      series: [
        {
          type: 'line',
          data: input.values.map((v) => [v.at.getTime(), v.value]),
          showSymbol: false,
          lineStyle: { color: LINE, width: 1.6 },
          markLine: {
            symbol: 'none',
            silent: true,
            data: levels,
          },
        },
      ],
    });
    return chart.renderToSVGString();
  } finally {
    chart.dispose();
  }
}

/** The SVG as a data URL for an `<img>` (the sender makes it a CID attachment). */
export function svgDataUrl(svg: string): string {
  return `data:image/svg+xml;base64,${Buffer.from(svg, 'utf8').toString('base64')}`;
}
