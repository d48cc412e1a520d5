/**
 * An HTTP client that connects from a chosen loopback source address (127.0.0.0/8), so a test can
 * play several machines against one server on 127.0.0.1. Keeps cookies and sends the CSRF header
 * like the Angular client. Uses node:http because supertest cannot bind a local address.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Express } from 'express';
import { DEMO_PASSWORD } from '../../server/seed/index.js';

export interface LoopbackResponse {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: any; // eslint-disable-line @typescript-eslint/no-explicit-any -- JSON of any route
  /** Milliseconds from sending to the end of the answer. */
  ms: number;
}

/** Listens on 127.0.0.1 on a free port; resolves with the base URL and a close function. */
export async function listen(app: Express): Promise<{ port: number; close: () => Promise<void> }> {
  const server = await new Promise<http.Server>((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  return {
    port,
    close: () =>
      new Promise((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

export class LoopbackClient {
  private cookies = new Map<string, string>();
  csrf = '';

  constructor(
    readonly port: number,
    readonly localAddress: string,
  ) {}

  /** The same browser (cookies, CSRF token) talking to another instance. */
  on(port: number): LoopbackClient {
    const other = new LoopbackClient(port, this.localAddress);
    other.cookies = this.cookies;
    other.csrf = this.csrf;
    return other;
  }

  request(method: string, path: string, body?: unknown): Promise<LoopbackResponse> {
    const data = body === undefined ? undefined : JSON.stringify(body);
    const headers: Record<string, string> = { accept: 'application/json' };
    if (data !== undefined) headers['content-type'] = 'application/json';
    if (this.cookies.size)
      headers.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
    if (method !== 'GET' && this.csrf) headers['x-xsrf-token'] = this.csrf;
    const started = performance.now();
    return new Promise((resolve, reject) => {
      const req = http.request(
        {
          host: '127.0.0.1',
          port: this.port,
          localAddress: this.localAddress,
          method,
          path,
          headers,
          agent: false,
        },
        (res) => {
          const chunks: Buffer[] = [];
          res.on('data', (c: Buffer) => chunks.push(c));
          res.on('end', () => {
            for (const c of ([] as string[]).concat(res.headers['set-cookie'] ?? [])) {
              const [pair] = c.split(';');
              const at = pair!.indexOf('=');
              const name = pair!.slice(0, at);
              const value = pair!.slice(at + 1);
              this.cookies.set(name, value);
              if (name === 'XSRF-TOKEN') this.csrf = decodeURIComponent(value);
            }
            const text = Buffer.concat(chunks).toString('utf8');
            let parsed: unknown = text;
            try {
              parsed = text ? JSON.parse(text) : undefined;
            } catch {
              // not JSON: keep the text
            }
            resolve({
              status: res.statusCode ?? 0,
              headers: res.headers,
              body: parsed,
              ms: performance.now() - started,
            });
          });
        },
      );
      req.on('error', reject);
      req.end(data);
    });
  }

  async post(path: string, body?: unknown): Promise<LoopbackResponse> {
    if (!this.csrf) await this.request('GET', '/api/auth/csrf');
    return this.request('POST', path, body);
  }

  get(path: string): Promise<LoopbackResponse> {
    return this.request('GET', path);
  }

  signIn(email: string, password = DEMO_PASSWORD): Promise<LoopbackResponse> {
    return this.post('/api/auth/sign-in', { email, password });
  }
}
