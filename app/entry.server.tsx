import { randomBytes } from "node:crypto";
import { Transform } from "node:stream";
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import { isRouteErrorResponse, ServerRouter, type EntryContext, type HandleErrorFunction } from "react-router";
import { databaseFaultContext } from "~/context";
import { isDatabaseUnavailable } from "~/db.server";

export const streamTimeout = 5_000;

// Pages may not be framed elsewhere, nor their type guessed, nor their address leaked to other sites.
// Scripts run only from this origin or inline with this response's nonce (React Router's hydration
// scripts carry it), so an injected inline script does not run.
function setDocumentHeaders(headers: Headers, nonce: string) {
  headers.set("Content-Type", "text/html; charset=utf-8");
  headers.set("X-Content-Type-Options", "nosniff");
  headers.set("Referrer-Policy", "same-origin");
  headers.set("X-Frame-Options", "DENY");
  headers.set("Content-Security-Policy", `script-src 'self' 'nonce-${nonce}'; frame-ancestors 'none'; base-uri 'self'; form-action 'self'; object-src 'none'`);
}

/**
 * React writes a page in 4 kB pieces; each piece would go on through the web stream, compression
 * and the socket one by one. This joins what React writes within one turn of the event loop into
 * one chunk, so a page leaves in a few large writes. `onEnd` runs once the last byte is through.
 */
function coalescingStream(onEnd: () => void): Transform {
  let pieces: Buffer[] = [];
  let scheduled = false;
  const stream = new Transform({
    transform(chunk: Buffer, _encoding, callback) {
      pieces.push(chunk);
      if (!scheduled) {
        scheduled = true;
        setImmediate(release);
      }
      callback();
    },
    flush(callback) {
      release();
      onEnd();
      callback();
    },
  });
  function release() {
    scheduled = false;
    if (!pieces.length) return;
    const joined = pieces.length === 1 ? pieces[0] : Buffer.concat(pieces);
    pieces = [];
    stream.push(joined);
  }
  return stream;
}

export default function handleRequest(request: Request, responseStatusCode: number, responseHeaders: Headers, routerContext: EntryContext) {
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }

  // A fresh nonce per response (128 bits): ServerRouter hands it to <Scripts>, <ScrollRestoration> and <Links>.
  const nonce = randomBytes(16).toString("base64");
  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    // Crawlers get the whole document at once; people get it streamed.
    const readyOption: keyof RenderToPipeableStreamOptions = (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

    const { pipe, abort } = renderToPipeableStream(<ServerRouter context={routerContext} url={request.url} nonce={nonce} />, {
      nonce,
      [readyOption]() {
        shellRendered = true;
        const body = coalescingStream(() => {
          clearTimeout(timeoutId);
          timeoutId = undefined;
        });
        setDocumentHeaders(responseHeaders, nonce);
        pipe(body);
        resolve(new Response(createReadableStreamFromReadable(body), { headers: responseHeaders, status: responseStatusCode }));
      },
      onShellError(error: unknown) {
        reject(error);
      },
      onError(error: unknown) {
        responseStatusCode = 500;
        if (shellRendered) console.error(error);
      },
    });
  });
}

// Refusals and misses (4xx) are answers, not faults: only real errors reach the log. A database lost
// mid-request is marked on the request's context, so the root middleware answers 503 (app/auth.server.ts);
// React Router calls this inside the middleware chain, before the middleware's next() returns.
export const handleError: HandleErrorFunction = (error, { request, context }) => {
  if (isDatabaseUnavailable(error)) {
    context.set(databaseFaultContext, true);
    console.error(`database unavailable during ${request.method} ${new URL(request.url).pathname}: ${error instanceof Error ? error.message : String(error)}`);
    return;
  }
  if (request.signal.aborted) return;
  if (isRouteErrorResponse(error) && error.status < 500) return;
  console.error(error);
};
