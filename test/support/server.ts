// Starts the built app on a free loopback port for browser tests, against the test database.
// freePort stays for a port where nothing should listen.
import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { fileURLToPath } from "node:url";

const root = fileURLToPath(new URL("../..", import.meta.url));

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as { port: number };
      server.close(() => resolve(port));
    });
  });
}

export async function startApp(env: Record<string, string> = {}): Promise<{ url: string; stop: () => Promise<void> }> {
  // PORT=0: the app binds a free port itself and prints it, so no other program can take the port
  // between choosing and binding it (two test runs on one machine once raced there).
  const child: ChildProcess = spawn(process.execPath, ["--import", "tsx", "bin/serve.ts"], {
    cwd: root,
    env: { ...process.env, NODE_ENV: "production", HOST: "127.0.0.1", PORT: "0", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  child.stdout?.on("data", (chunk) => (output += chunk));
  child.stderr?.on("data", (chunk) => (output += chunk));
  const deadline = Date.now() + 20_000;
  let url: string | undefined;
  for (;;) {
    url ??= output.match(/Stopwise listening on (http:\/\/127\.0\.0\.1:\d+)/)?.[1];
    if (url) {
      try {
        const res = await fetch(`${url}/api/health`);
        if (res.ok) break;
      } catch {
        // not answering yet
      }
    }
    if (child.exitCode !== null || Date.now() > deadline) throw new Error(`the app did not start:\n${output}`);
    await new Promise((r) => setTimeout(r, 150));
  }
  return {
    url,
    stop: () =>
      new Promise((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once("exit", () => resolve());
        child.kill("SIGTERM");
      }),
  };
}
