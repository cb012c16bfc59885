/**
 * JSON-lines logger. Field names that carry secrets are masked wherever they appear, so a
 * password, token, cookie or API key never reaches the log (OWASP ASVS 5.0 16.x).
 */
const levels = { silent: 0, error: 1, warn: 2, info: 3, debug: 4 } as const;
export type LogLevel = keyof typeof levels;

const SECRET_KEY = /pass(word)?|secret|token|cookie|authorization|api[-_]?key|jwt/i;

// Drizzle's "Failed query: … \nparams: …" carries the bound values (a reset link, a hash):
// they are cut from an error's message and stack wherever they appear.
const QUERY_PARAMS = /\nparams: [\s\S]*?(?=\n\s+at |$)/g;
const withoutParams = (s: string | undefined) => s?.replace(QUERY_PARAMS, '\nparams: [redacted]');

export function redact(value: unknown, depth = 0): unknown {
  if (depth > 6 || value === null || typeof value !== 'object') return value;
  if (value instanceof Error)
    return {
      name: value.name,
      message: withoutParams(value.message),
      stack: withoutParams(value.stack),
    };
  if (Array.isArray(value)) return value.slice(0, 50).map((v) => redact(v, depth + 1));
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value))
    out[k] = SECRET_KEY.test(k) ? '[redacted]' : redact(v, depth + 1);
  return out;
}

export interface Logger {
  error(msg: string, fields?: Record<string, unknown>): void;
  warn(msg: string, fields?: Record<string, unknown>): void;
  info(msg: string, fields?: Record<string, unknown>): void;
  debug(msg: string, fields?: Record<string, unknown>): void;
}

export function createLogger(
  level: LogLevel = 'info',
  write: (line: string) => void = (l) => process.stderr.write(l + '\n'),
): Logger {
  const at = levels[level];
  const emit = (
    lvl: Exclude<LogLevel, 'silent'>,
    msg: string,
    fields?: Record<string, unknown>,
  ) => {
    if (levels[lvl] > at) return;
    write(
      JSON.stringify({
        t: new Date().toISOString(),
        level: lvl,
        msg,
        ...(redact(fields ?? {}) as object),
      }),
    );
  };
  return {
    error: (m, f) => emit('error', m, f),
    warn: (m, f) => emit('warn', m, f),
    info: (m, f) => emit('info', m, f),
    debug: (m, f) => emit('debug', m, f),
  };
}
