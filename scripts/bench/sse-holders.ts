// A child process of the bench's live section: opens N server-sent-event streams with the given
// cookie and holds them, reading (and discarding) what arrives, so the clients' own work never
// competes with the bench process that times the readings. Each stream is a plain TCP socket
// that sends the GET and checks the status line, then reads into one shared buffer: the holders
// cost this 2-core machine as little as a load generator can (no HTTP parser, no allocation per
// read), leaving the cores to the processes measured. Prints "open N" once they are all answered
// 200, and on SIGTERM "alive N": the streams still open that received bytes in the last HEARD_WITHIN_MS.
//   tsx scripts/bench/sse-holders.ts BASE_URL COUNT HEARD_WITHIN_MS   (cookie in SSE_COOKIE)
import net from "node:net";

const [baseURL, countArg, heardArg] = process.argv.slice(2);
const count = Number(countArg);
const heardWithinMs = Number(heardArg);
const url = new URL("/api/stream", baseURL);
const request = Buffer.from(`GET ${url.pathname} HTTP/1.1\r\nHost: ${url.host}\r\nAccept: text/event-stream\r\nCookie: ${process.env.SSE_COOKIE ?? ""}\r\n\r\n`);
const readBuffer = Buffer.alloc(64 * 1024);
const streams: { open: boolean; lastHeardAt: number; socket: net.Socket }[] = [];

function openOne(): Promise<void> {
  return new Promise((resolve, reject) => {
    const state = { open: true, lastHeardAt: Date.now(), socket: null as unknown as net.Socket };
    let answered = false;
    state.socket = net.connect({
      host: url.hostname,
      port: Number(url.port),
      onread: {
        buffer: readBuffer,
        callback: (bytes) => {
          state.lastHeardAt = Date.now();
          if (answered) return true;
          answered = true;
          const status = readBuffer.toString("latin1", 0, Math.min(bytes, 64)).split("\r\n")[0];
          if (!/^HTTP\/1\.1 200 /.test(status)) {
            reject(new Error(`stream answered ${status}`));
            state.socket.destroy();
            return false;
          }
          streams.push(state);
          resolve();
          return true;
        },
      },
    });
    state.socket.on("connect", () => state.socket.write(request));
    state.socket.on("close", () => (state.open = false));
    state.socket.on("error", (err) => {
      state.open = false;
      if (!answered) reject(err);
    });
  });
}

for (let i = 0; i < count; i += 50) await Promise.all(Array.from({ length: Math.min(50, count - i) }, openOne));
process.stdout.write(`open ${streams.length}\n`);

const finish = () => {
  const since = Date.now() - heardWithinMs;
  process.stdout.write(`alive ${streams.filter((s) => s.open && s.lastHeardAt >= since).length}\n`);
  for (const s of streams) s.socket.destroy();
  process.exit(0);
};
process.on("SIGTERM", finish);
// Only SIGTERM ends the hold. (Its stdin is /dev/null when the bench spawns it, which ends at
// once: finishing on stdin's end closed every stream right after opening them.)
setInterval(() => undefined, 60_000);
