// The built app's real request handler, for supertest: no port, no mocks (run `react-router build` first; bin/test does).
import { createRequestListener } from "@react-router/node";
import { createServer, type Server } from "node:http";
import { fileURLToPath } from "node:url";
import { buildDirectory } from "../../react-router.config";

const buildPath = fileURLToPath(new URL(`../../${buildDirectory}/server/index.js`, import.meta.url));

export async function appServer(): Promise<Server> {
  const build = await import(/* @vite-ignore */ buildPath);
  return createServer(createRequestListener({ build, mode: "production" }));
}

/** Server-rendered HTML without React's text separators (`<!-- -->`), for looking for a sentence in it. */
export function visible(html: string): string {
  return html.replace(/<!-- -->/g, "");
}
