// A child process of the bench's live section: opens N server-sent-event streams with the given
// cookie and holds them, reading (and discarding) what arrives with node:http, so the clients'
// own work never competes with the bench process that times the readings. Prints
// "open N" once they are all answered 200, and on SIGTERM "alive N": the
// streams still open that received bytes in the last HEARD_WITHIN_MS.
//   tsx scripts/bench/sse-holders.ts BASE_URL COUNT HEARD_WITHIN_MS   (cookie in SSE_COOKIE)
import http from "node:http";

const [baseURL, countArg, heardArg] = process.argv.slice(2);
const count = Number(countArg);
const heardWithinMs = Number(heardArg);
const url = new URL("/api/stream", baseURL);
const agent = new http.Agent({ keepAlive: false, maxSockets: Infinity });
const streams: { open: boolean; lastHeardAt: number; req: http.ClientRequest }[] = [];

function openOne(): Promise<void> {
  return new Promise((resolve, reject) => {
    const state = { open: true, lastHeardAt: Date.now(), req: null as unknown as http.ClientRequest };
    state.req = http.get(url, { agent, headers: { accept: "text/event-stream", cookie: process.env.SSE_COOKIE ?? "" } }, (res) => {
      if (res.statusCode !== 200) return reject(new Error(`stream answered ${res.statusCode}`));
      res.on("data", () => (state.lastHeardAt = Date.now()));
      res.on("close", () => (state.open = false));
      streams.push(state);
      resolve();
    });
    state.req.on("error", (err) => {
      state.open = false;
      if (!streams.includes(state)) reject(err);
    });
  });
}

for (let i = 0; i < count; i += 50) await Promise.all(Array.from({ length: Math.min(50, count - i) }, openOne));
process.stdout.write(`open ${streams.length}\n`);

const finish = () => {
  const since = Date.now() - heardWithinMs;
  process.stdout.write(`alive ${streams.filter((s) => s.open && s.lastHeardAt >= since).length}\n`);
  for (const s of streams) s.req.destroy();
  process.exit(0);
};
process.on("SIGTERM", finish);
// Only SIGTERM ends the hold. (Its stdin is /dev/null when the bench spawns it, which ends at
// once: finishing on stdin's end closed every stream right after opening them.)
setInterval(() => undefined, 60_000);
