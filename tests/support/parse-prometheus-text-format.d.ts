declare module 'parse-prometheus-text-format' {
  /** One metric family of the text exposition format, as the package returns it. */
  interface MetricFamily {
    name: string;
    help: string;
    type: 'COUNTER' | 'GAUGE' | 'HISTOGRAM' | 'SUMMARY' | 'UNTYPED';
    metrics: {
      value?: string;
      count?: string;
      sum?: string;
      labels?: Record<string, string>;
      buckets?: Record<string, string>;
    }[];
  }
  export default function parsePrometheusTextFormat(text: string): MetricFamily[];
}
