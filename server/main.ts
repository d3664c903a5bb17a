// The web server: Next.js (Next's documented custom-server setup) behind a plain node:http server
// that answers the live stream itself (server/stream/handler.ts), because a Next route handler's
// per-request machinery costs far more memory per open stream than the stream does (README,
// "Speed and scale"). Everything else goes to Next.
//   tsx server/main.ts [-H host] [-p port] [--dev]      (npm start / npm run dev)
// Production needs `next build` first. TW_BENCH_HEAP=1 with node's --expose-gc: on SIGUSR2 the
// server runs a full collection and prints "heap-after-gc <bytes>" (the bench's live heap figure).
import http from "node:http";
import { parseArgs } from "node:util";
import { exitUnlessSecretsSet } from "@/ingest/secrets";

const { values: args } = parseArgs({
  options: { hostname: { type: "string", short: "H" }, port: { type: "string", short: "p" }, dev: { type: "boolean", default: false } },
});
const dev = args.dev ?? false;
// Set before Next (or React) is loaded, as `next start` and `next dev` do.
Object.assign(process.env, { NODE_ENV: process.env.NODE_ENV ?? (dev ? "development" : "production") });

// Refuse to start without the secrets, before listening or connecting anywhere (instrumentation.ts
// makes the same check for Next's own start).
exitUnlessSecretsSet("web", ["AUTH_SECRET", "MQTT_WEB_PASSWORD"]);

const port = Number(args.port ?? process.env.PORT ?? 3000);
// Every interface unless -H says otherwise, as `next start`.
const hostname = args.hostname;

const { default: next } = await import("next");
const { STREAM_PATH, handleStream } = await import("./stream/handler");

const app = next({ dev, hostname: hostname ?? "localhost", port });
const handleWithNext = app.getRequestHandler();
await app.prepare();

const server = http.createServer((req, res) => {
  const url = req.url ?? "/";
  const query = url.indexOf("?");
  const pathname = query === -1 ? url : url.slice(0, query);
  if (pathname === STREAM_PATH) void handleStream(req, res);
  else void handleWithNext(req, res);
});

if (process.env.TW_BENCH_HEAP === "1") {
  const gc = (globalThis as { gc?: () => void }).gc;
  if (!gc) throw new Error("TW_BENCH_HEAP=1 needs node's --expose-gc flag");
  process.on("SIGUSR2", () => {
    gc();
    console.log(`heap-after-gc ${process.memoryUsage().heapUsed}`);
  });
}

server.listen(port, hostname, () => {
  console.log(`> Ready on http://${hostname ?? "localhost"}:${port} (${dev ? "development" : "production"})`);
});

// Stop on a signal the way `next start` does: stop listening, then exit.
for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.once(signal, () => {
    server.close();
    server.closeAllConnections();
    process.exit(0);
  });
}
