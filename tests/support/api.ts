/** A small HTTP client with a cookie jar, for integration tests against the running server. */
export const BASE_URL = process.env.RINGLAND_BASE_URL ?? "http://localhost:4321";
export const MAIL_INBOX_URL = process.env.RINGLAND_MAIL_INBOX_URL ?? "http://127.0.0.1:8025";

export interface ApiResponse<T = any> {
  status: number;
  body: T;
  headers: Headers;
}

export class ApiClient {
  cookies = new Map<string, string>();
  setCookieLines: string[] = [];

  cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
  }

  private remember(res: Response): void {
    const lines = res.headers.getSetCookie();
    this.setCookieLines = lines;
    for (const line of lines) {
      const [pair] = line.split(";");
      const eq = pair.indexOf("=");
      const name = pair.slice(0, eq).trim();
      const value = pair.slice(eq + 1).trim();
      if (value === "" || /Max-Age=0/i.test(line)) this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
  }

  async request<T = any>(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<ApiResponse<T>> {
    // Like a browser, send Origin on every request that changes something (Astro's origin check
    // refuses a body-less DELETE from nowhere).
    const base: Record<string, string> = method === "GET" || method === "HEAD" ? {} : { origin: new URL(BASE_URL).origin };
    const init: RequestInit = { method, headers: { ...base, ...headers }, redirect: "manual" };
    if (this.cookies.size) (init.headers as Record<string, string>).cookie = this.cookieHeader();
    if (body !== undefined) {
      if (typeof body === "string") init.body = body;
      else {
        init.body = JSON.stringify(body);
        (init.headers as Record<string, string>)["content-type"] ??= "application/json";
      }
    }
    const res = await fetch(BASE_URL + path, init);
    this.remember(res);
    const text = await res.text();
    let parsed: unknown = text;
    if ((res.headers.get("content-type") ?? "").includes("json")) parsed = text ? JSON.parse(text) : null;
    return { status: res.status, body: parsed as T, headers: res.headers };
  }

  get<T = any>(path: string): Promise<ApiResponse<T>> {
    return this.request<T>("GET", path);
  }
  post<T = any>(path: string, body: unknown = {}): Promise<ApiResponse<T>> {
    return this.request<T>("POST", path, body);
  }
  patch<T = any>(path: string, body: unknown): Promise<ApiResponse<T>> {
    return this.request<T>("PATCH", path, body);
  }
  delete<T = any>(path: string): Promise<ApiResponse<T>> {
    return this.request<T>("DELETE", path);
  }

  async signIn(email: string, password = "ringland-demo"): Promise<ApiResponse> {
    const res = await this.post("/api/auth/sign-in", { email, password });
    if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
    return res;
  }
}

export async function signedIn(email: string, password = "ringland-demo"): Promise<ApiClient> {
  const c = new ApiClient();
  await c.signIn(email, password);
  return c;
}

export const DEMO = {
  owner: "owner@ringland.example",
  manager: "manager@ringland.example",
  chief: "chief@ringland.example",
  mechanic: "mechanic@ringland.example",
  viewer: "viewer@ringland.example",
  otherOwner: "nell@larchwind.example",
} as const;
