/** Every setting Trayplan reads from the environment, in one place (the README lists them). */
export interface Config {
  /** Whether this is a development or test run (enables the mail fake's page). */
  development: boolean;
  host: string;
  port: number;
  /** Public address of the app, used in links inside e-mail. */
  appUrl: string;
  databaseUrl: string;
  /** SMTP server URL for nodemailer; `fake` starts the embedded loopback fake. */
  smtpUrl: string;
  mailFrom: string;
  sessionSecret: string;
  /** Minutes without a request before a session ends. */
  sessionIdleMinutes: number;
  /** Whether the app runs behind an HTTPS proxy (cookies get Secure, HSTS). */
  behindHttps: boolean;
  /** Proxies in front of the app whose X-Forwarded-For is trusted (0: none, the peer is the client). */
  trustProxyHops: number;
}

function int(value: string | undefined, fallback: number): number {
  const n = value === undefined || value === '' ? NaN : Number(value);
  return Number.isInteger(n) && n > 0 ? n : fallback;
}

/** A whole number of proxy hops, 0 allowed; anything else falls back. */
function hops(value: string | undefined, fallback: number): number {
  const n = value === undefined || value === '' ? NaN : Number(value);
  return Number.isInteger(n) && n >= 0 && n <= 10 ? n : fallback;
}

/** Reads the configuration; `overrides` lets tests set values without touching process.env. */
export function loadConfig(overrides: Partial<Config> = {}): Config {
  const env = process.env;
  const development = (env.NODE_ENV ?? 'development') !== 'production';
  const port = int(env.PORT, 3000);
  const host = env.HOST ?? '127.0.0.1';
  const secret = env.SESSION_SECRET ?? (development ? 'trayplan-development-only-secret' : '');
  if (!secret && !overrides.sessionSecret) {
    throw new Error('SESSION_SECRET must be set in production.');
  }
  return {
    development,
    host,
    port,
    appUrl: env.APP_URL ?? `http://${host}:${port}`,
    databaseUrl: env.DATABASE_URL ?? '',
    smtpUrl: env.SMTP_URL ?? (development ? 'fake' : ''),
    mailFrom: env.MAIL_FROM ?? 'Trayplan <no-reply@trayplan.example>',
    sessionSecret: secret,
    sessionIdleMinutes: int(env.SESSION_IDLE_MINUTES, 120),
    behindHttps: env.BEHIND_HTTPS === 'true',
    trustProxyHops: hops(env.TRUST_PROXY_HOPS, env.BEHIND_HTTPS === 'true' ? 1 : 0),
    ...overrides,
  };
}
