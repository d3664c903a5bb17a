// npm run simulator: publishes raw probe signals for every seeded tank, one MQTT client per
// controller with the controller's own credentials. See args.ts for the flags, tank-sim.ts for
// the physics and faults.ts for the faults. With --duration it ends by printing
//   simulator done {"messages":M,"samples":S,"failed":F,"unacknowledged":U}
// where S counts the samples the broker acknowledged (what the ingest will store).
import { getClient } from "../../db/client";
import { mqttUrl } from "../../ingest/topics";
import type { RawSample, SimControl } from "../../ingest/payloads";
import { parseSimArgs, type FaultSpec } from "./args";
import { listenForControl } from "./control";
import { Device, type PublishCounters } from "./device";
import { applyFault } from "./faults";
import { loadFleet, readCredentials, type SimTank } from "./fleet";
import { isBufferId, TankSim } from "./tank-sim";
import { exitUnlessSecretsSet } from "../../ingest/secrets";

exitUnlessSecretsSet("simulator", ["MQTT_SIMULATOR_PASSWORD"]);

const log = (line: string) => console.log(`[simulator] ${line}`);
const args = parseSimArgs(process.argv.slice(2));
const url = mqttUrl();
const periodMs = Math.round(1000 / args.rate);

const { tanks, skipped } = await loadFleet(getClient(), readCredentials(args.credentials));
for (const s of skipped) log(`not simulated: ${s}`);
if (tanks.length === 0) throw new Error("no tank to simulate: seed the database first (npm run db:seed)");

// Virtual tank i is a copy of seeded tank i mod n. A copy publishes as its original (same
// controller, same probes) with its timestamps offset by a few ms, so its rows stay distinct.
const virtualCount = args.tanks ?? tanks.length;
const copiesPerTank = Math.ceil(virtualCount / tanks.length);
if (copiesPerTank > periodMs) throw new Error(`--tanks ${virtualCount} at --rate ${args.rate} needs ${copiesPerTank} copies of a tank per ${periodMs} ms tick; at most ${periodMs}`);
const start = Date.now();
const sims: { sim: TankSim; copy: number; offsetMs: number }[] = [];
for (let i = 0; i < virtualCount; i++) {
  const copy = Math.floor(i / tanks.length);
  sims.push({ sim: new TankSim(tanks[i % tanks.length], copy, start), copy, offsetMs: Math.floor((copy * periodMs) / copiesPerTank) });
}

const counters: PublishCounters = { messages: 0, samples: 0, failed: 0, pending: 0 };
const devices = new Map<string, Device>();
for (const t of tanks.slice(0, Math.min(virtualCount, tanks.length))) {
  const d = new Device(t.credential, url, counters, log);
  d.connect();
  devices.set(t.controllerId, d);
}

function matches(tank: SimTank, selector: string): boolean {
  return tank.controllerId === selector || String(tank.id) === selector || tank.name.toLowerCase().startsWith(selector.toLowerCase());
}

function applyControl(controllerId: string, msg: SimControl, now: number) {
  const device = devices.get(controllerId);
  if (!device) return;
  for (const { sim } of sims) {
    if (sim.tank.controllerId !== controllerId) continue;
    if (msg.fault) sim.faults = applyFault(sim.faults, msg.fault, msg.measure, now);
    if (msg.placeIn) {
      if (msg.placeIn !== "tank" && !device.dosingInhibited(now)) {
        log(`${controllerId}: not placing the probe: the tank is not held (dosing is not inhibited)`);
      } else if (msg.placeIn === "tank") {
        sim.place("tank", now);
      } else if (msg.placeIn.kind === "ph-buffer") {
        if (isBufferId(msg.placeIn.buffer)) sim.place({ kind: "ph-buffer", buffer: msg.placeIn.buffer }, now);
        else log(`${controllerId}: unknown buffer "${msg.placeIn.buffer}"`);
      } else {
        sim.place({ kind: "ec-standard", ec25UsPerCm: msg.placeIn.ec25UsPerCm }, now);
      }
    }
  }
  if (msg.fault === "offline") device.setOffline(true);
  if (msg.fault === "none" && !msg.measure) device.setOffline(false);
  log(`${controllerId}: control ${JSON.stringify(msg)}`);
}

for (const f of args.fault as FaultSpec[]) {
  const target = tanks.find((t) => matches(t, f.tank));
  if (!target) throw new Error(`--fault ${f.tank}:${f.cause}: no simulated tank matches "${f.tank}"`);
  applyControl(target.controllerId, { v: 1, fault: f.cause, measure: f.measure }, start);
}
const control = listenForControl(url, (id, msg) => applyControl(id, msg, Date.now()), log);
// The end-to-end set-up waits for this line before its tests send faults or place holds.
void Promise.all([control.subscribed, ...[...devices.values()].map((d) => d.subscribed)]).then(() =>
  log("ready: listening for control messages and dosing commands"),
);

log(`${virtualCount} tanks (${tanks.length} seeded${copiesPerTank > 1 ? `, ${copiesPerTank} copies each` : ""}) at ${args.rate} Hz via ${url}`);

// Ticks on a fixed grid (start + k·period), so timestamps are regular whatever the timer jitter.
let tick = 0;
const firstTick = Math.ceil(start / periodMs) * periodMs;
let timer: NodeJS.Timeout | null = null;
const endAt = args.duration === undefined ? Infinity : start + args.duration * 1000;

function runTick() {
  const t = firstTick + tick * periodMs;
  if (t >= endAt) return finish();
  tick++;
  for (const { sim, offsetMs } of sims) {
    const device = devices.get(sim.tank.controllerId)!;
    // Placement ends with the hold: the probe goes back in the tank.
    if (sim.placement && !device.dosingInhibited(t)) sim.place("tank", t);
    sim.step(t, periodMs, device.dosingInhibited(t));
    if (device.isOffline) continue;
    const ts = t + offsetMs;
    const s = sim.signals(ts, periodMs);
    const p = sim.tank.probes;
    const samples: RawSample[] = [
      { serial: p.ph.serial, ts, signal: s.ph },
      { serial: p.ec.serial, ts, signal: s.ec },
      { serial: p.temp.serial, ts, signal: s.temp },
    ];
    device.publish(samples);
  }
  timer = setTimeout(runTick, Math.max(0, firstTick + tick * periodMs - Date.now()));
}

const progress = setInterval(() => log(`${counters.samples} samples acknowledged, ${counters.pending} messages in flight`), 10_000);

let finishing = false;
async function finish() {
  if (finishing) return;
  finishing = true;
  if (timer) clearTimeout(timer);
  clearInterval(progress);
  // Wait for the broker to acknowledge what is in flight (it may be restarting).
  const deadline = Date.now() + 30_000;
  while (counters.pending > 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
  console.log(
    `simulator done ${JSON.stringify({ messages: counters.messages, samples: counters.samples, failed: counters.failed, unacknowledged: counters.pending })}`,
  );
  await Promise.all([...devices.values()].map((d) => d.close()));
  control.client.end(true);
  process.exit(counters.pending > 0 || counters.failed > 0 ? 1 : 0);
}

for (const signal of ["SIGTERM", "SIGINT"] as const) process.on(signal, () => void finish());
timer = setTimeout(runTick, Math.max(0, firstTick - Date.now()));
