/**
 * fetch with a cookie jar, behaving like a browser tab for the API tests: it keeps the cookies the
 * server sets and sends the page's Origin on writes, as browsers do.
 */

export interface ApiResponse {
  status: number;
  headers: Headers;
  /** Parsed JSON body, or null when the body is empty or not JSON. */
  body: any;
  text: string;
}

export interface RequestOptions {
  /** Sent as JSON unless `raw` is given. */
  json?: unknown;
  /** A raw body sent as is (with `contentType`, default application/json). */
  raw?: string;
  contentType?: string;
  headers?: Record<string, string>;
}

export class Client {
  readonly cookies = new Map<string, string>();

  constructor(readonly baseUrl: string) {}

  /** Sends a request and records any Set-Cookie (a cookie with Max-Age=0 is removed). */
  async request(method: string, path: string, options: RequestOptions = {}): Promise<ApiResponse> {
    const headers: Record<string, string> = { ...options.headers };
    if (this.cookies.size > 0) headers.cookie = [...this.cookies].map(([name, value]) => `${name}=${value}`).join('; ');
    if (method !== 'GET' && method !== 'HEAD') headers.origin ??= this.baseUrl;
    let body: string | undefined;
    if (options.raw !== undefined || options.json !== undefined) {
      body = options.raw ?? JSON.stringify(options.json);
      headers['content-type'] ??= options.contentType ?? 'application/json';
    }
    const response = await fetch(this.baseUrl + path, { method, headers, body, redirect: 'manual' });
    for (const line of response.headers.getSetCookie()) this.storeCookie(line);
    const text = await response.text();
    let parsed: unknown = null;
    try {
      parsed = text ? JSON.parse(text) : null;
    } catch {
      parsed = null;
    }
    return { status: response.status, headers: response.headers, body: parsed, text };
  }

  get(path: string, options?: RequestOptions) {
    return this.request('GET', path, options);
  }

  post(path: string, json?: unknown, options: RequestOptions = {}) {
    return this.request('POST', path, json === undefined ? options : { ...options, json });
  }

  patch(path: string, json?: unknown, options: RequestOptions = {}) {
    return this.request('PATCH', path, json === undefined ? options : { ...options, json });
  }

  /** Signs in and returns the response (cookie kept on success). */
  signIn(email: string, password: string) {
    return this.post('/api/auth/sign-in', { email, password });
  }

  private storeCookie(line: string): void {
    const [pair, ...attributes] = line.split(';');
    const separator = pair!.indexOf('=');
    const name = pair!.slice(0, separator).trim();
    const value = pair!.slice(separator + 1).trim();
    const expired = attributes.some((attribute) => /^\s*max-age=0\s*$/i.test(attribute)) || value === '';
    if (expired) this.cookies.delete(name);
    else this.cookies.set(name, value);
  }
}

/** The name of the session cookie (kept in step with src/lib/server/auth/lucia.ts). */
export const sessionCookie = 'quadrille_session';
