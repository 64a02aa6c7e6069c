/** Child processes of the start and test scripts: started with their own PIDs, stopped on exit. */
import { spawn, type ChildProcess } from "node:child_process";
import { createServer, connect } from "node:net";

export interface Child {
  name: string;
  process: ChildProcess;
  exited: Promise<number | null>;
  stop(): Promise<void>;
}

export function startChild(
  name: string,
  args: string[],
  env: NodeJS.ProcessEnv,
  opts: { quiet?: boolean; cwd?: string } = {},
): Child {
  const child = spawn(process.execPath, args, {
    env,
    cwd: opts.cwd,
    stdio: ["ignore", "pipe", "pipe"],
  });
  const prefix = `[${name}] `;
  const relay = (stream: NodeJS.ReadableStream | null, target: NodeJS.WriteStream): void => {
    if (!stream) return;
    let buffer = "";
    stream.on("data", (chunk: Buffer) => {
      buffer += chunk.toString();
      const lines = buffer.split("\n");
      buffer = lines.pop() ?? "";
      if (!opts.quiet) for (const line of lines) target.write(prefix + line + "\n");
    });
  };
  relay(child.stdout, process.stdout);
  relay(child.stderr, process.stderr);
  const exited = new Promise<number | null>((res) => child.on("exit", (code) => res(code)));
  return {
    name,
    process: child,
    exited,
    stop: async () => {
      if (child.exitCode !== null || child.signalCode !== null) return;
      child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), 10_000);
      await exited;
      clearTimeout(timer);
    },
  };
}

export function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const server = createServer();
    server.unref();
    server.on("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      const port = typeof address === "object" && address ? address.port : 0;
      server.close(() => resolvePort(port));
    });
  });
}

export function isPortOpen(port: number, host = "127.0.0.1"): Promise<boolean> {
  return new Promise((res) => {
    const socket = connect({ port, host });
    socket.once("connect", () => {
      socket.destroy();
      res(true);
    });
    socket.once("error", () => res(false));
  });
}

export async function waitFor(
  what: string,
  check: () => Promise<boolean>,
  child: Child | null,
  timeoutMs = 60_000,
): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let dead = false;
  child?.exited.then(() => {
    dead = true;
  });
  while (!(await check().catch(() => false))) {
    if (dead) throw new Error(`${what} exited before it was ready`);
    if (Date.now() > deadline) throw new Error(`${what} was not ready within ${timeoutMs / 1000} s`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

export async function httpOk(url: string): Promise<boolean> {
  const res = await fetch(url, { signal: AbortSignal.timeout(2000) });
  return res.ok;
}
