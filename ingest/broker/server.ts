// The embedded MQTT broker: aedes 1.x on a TCP port, with Tidewell's authentication and
// topic authorisation, a durable subscription for the ingest registered before any device can
// publish, and a graceful shutdown that drains to the ingest and spools what is left.
import net from "node:net";
import { Aedes, type Client, type PublishPacket, type Subscription } from "aedes";
import memoryPersistence from "aedes-persistence";
import type { Client as DbClient } from "@libsql/client";
import { ingestClientId, topics } from "../topics";
import { errorText, printable, type Logger } from "../log";
import { canPublish, canSubscribe, mayRetain } from "./acl";
import { authenticate } from "./authenticate";
import { ConnectThrottle, DEFAULT_THROTTLE } from "./connect-throttle";
import { DeviceDirectory } from "./device-directory";
import { describePrincipal, type Principal } from "./principals";
import { OutgoingStore, withOverrides } from "./outgoing-store";
import { cachedSubscriptions, cacheRouterMatches } from "./topic-match-cache";
import { restoreState, saveState, type SpoolPersistence } from "./state-file";

export interface BrokerOptions {
  host: string;
  port: number;
  db: DbClient;
  log: Logger;
  /** Where a graceful shutdown spools retained and queued messages; null: nowhere. */
  stateFile: string | null;
  /** How long a graceful shutdown waits for the ingest to take its queued messages. */
  drainMs: number;
  deviceCacheTtlMs: number;
  deviceRecheckMs: number;
  maxDevicePayloadBytes: number;
  /** Failed device connects a source address (a username) may make per minute before it is refused unchecked. */
  failedConnectsPerAddress: number;
  failedConnectsPerUsername: number;
}

export interface RunningBroker {
  port: number;
  close(): Promise<void>;
}

/** The parts of aedes-persistence used beyond the typed Aedes API. */
interface Persistence extends SpoolPersistence {
  addSubscriptions(client: { id: string }, subs: { topic: string; qos: 0 | 1 | 2 }[]): Promise<void>;
}

/** Marks our own refusals (already logged) so the error events do not log them again. */
class Refusal extends Error {}

type AuthError = Refusal & { returnCode: number };
const authError = (message: string, returnCode: number): AuthError => Object.assign(new Refusal(message), { returnCode });

export async function startBroker(opts: BrokerOptions): Promise<RunningBroker> {
  const { log } = opts;
  const principals = new WeakMap<Client, Principal>();
  const clients = new Set<Client>();
  const devicesByUsername = new Map<string, Set<Client>>();
  const directory = new DeviceDirectory(opts.db, { cacheTtlMs: opts.deviceCacheTtlMs, recheckMs: opts.deviceRecheckMs });
  const throttles = {
    // Up to 8 checks from one address at once (a farm's controllers may share one and all reconnect
    // after a broker restart), one per username: a burst costs at most the free failures plus 8.
    byAddress: new ConnectThrottle({ ...DEFAULT_THROTTLE, freeFailures: opts.failedConnectsPerAddress, concurrent: 8 }),
    byUsername: new ConnectThrottle({ ...DEFAULT_THROTTLE, freeFailures: opts.failedConnectsPerUsername, concurrent: 1 }),
  };
  const ingestId = ingestClientId();
  const who = (client: Client | null) => {
    const p = client ? principals.get(client) : undefined;
    return p ? describePrincipal(p) : "unauthenticated client";
  };

  const outgoing = new OutgoingStore();
  const memory = memoryPersistence();
  const broker = await Aedes.createBroker({
    persistence: withOverrides(memory, { ...outgoing.methods, ...cachedSubscriptions(memory as unknown as Record<string, unknown>) }),
    drainTimeout: 30_000,
    authenticate(client, username, password, done) {
      const from = remoteAddress(client);
      authenticate(directory, throttles, { clientId: client.id, username, password, address: remoteHost(client) })
        .then((result) => {
          if (result.ok) {
            principals.set(client, result.principal);
            return done(null, true);
          }
          log.warn(`refused connection: ${result.reason} (username "${printable(username ?? "")}", client id "${printable(client.id)}", from ${from})`);
          done(authError(result.reason, result.code), false);
        })
        .catch((err: unknown) => {
          // The database is unreachable or not migrated: say "server unavailable" so devices retry.
          log.error(`refused connection from ${from}: credentials could not be checked`, err);
          done(authError("server unavailable", 3), false);
        });
    },
    authorizePublish(client: Client | null, packet: PublishPacket, done) {
      const p = client ? principals.get(client) : undefined;
      if (!p || !canPublish(p, packet.topic)) {
        log.warn(`refused publish by ${who(client)} to "${printable(packet.topic, 120)}"`);
        return done(new Refusal("not authorised to publish to this topic"));
      }
      if (p.kind === "device" && packet.payload.length > opts.maxDevicePayloadBytes) {
        log.warn(`refused publish by ${who(client)}: payload of ${packet.payload.length} bytes is above ${opts.maxDevicePayloadBytes}`);
        return done(new Refusal("payload too large"));
      }
      if (packet.retain && !mayRetain(p)) packet.retain = false;
      done(null);
    },
    authorizeSubscribe(client: Client, sub: Subscription, done) {
      const p = principals.get(client);
      if (!p || !canSubscribe(p, sub.topic)) {
        log.warn(`refused subscription by ${who(client)} to "${printable(sub.topic, 120)}"`);
        return done(null, null); // negated: SUBACK 0x80 for this filter, connection kept
      }
      done(null, sub);
    },
  });
  cacheRouterMatches((broker as unknown as { mq: unknown }).mq); // aedes keeps its router here, untyped

  broker.on("client", (client) => {
    clients.add(client);
    const p = principals.get(client);
    if (p?.kind === "device") {
      const set = devicesByUsername.get(p.username) ?? new Set<Client>();
      set.add(client);
      devicesByUsername.set(p.username, set);
    }
  });
  broker.on("clientDisconnect", (client) => {
    clients.delete(client);
    const p = principals.get(client);
    if (p?.kind === "device") {
      const set = devicesByUsername.get(p.username);
      set?.delete(client);
      if (set && set.size === 0) devicesByUsername.delete(p.username);
    }
  });
  const onError = (client: Client, err: Error) => {
    if (err instanceof Refusal) return;
    log.warn(`connection error for ${who(client)} (client id "${printable(client.id)}"): ${errorText(err)}`);
  };
  broker.on("clientError", onError);
  broker.on("connectionError", onError);

  directory.watch(
    () => devicesByUsername.keys(),
    (username, why) => {
      const set = devicesByUsername.get(username);
      if (!set || set.size === 0) return;
      log.warn(`disconnecting device ${printable(username)}: ${why}`);
      for (const client of set) client.close();
    },
  );

  const persistence = (broker as unknown as { persistence: Persistence }).persistence;
  // The ingest's persistent session exists from the broker's first moment, so QoS 1 raw
  // messages published before the ingest (re)connects are queued for it, not dropped.
  await persistence.addSubscriptions({ id: ingestId }, [{ topic: topics.rawWildcard, qos: 1 }]);
  if (opts.stateFile) {
    try {
      const restored = await restoreState(opts.stateFile, persistence);
      if (restored.retained || restored.queued) {
        log.info(`restored ${restored.retained} retained and ${restored.queued} queued messages from ${opts.stateFile}`);
      }
    } catch (err) {
      log.error("could not restore the broker state", err);
    }
  }

  const server = net.createServer((socket) => {
    coalesceWrites(socket);
    broker.handle(socket);
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, opts.host, () => resolve());
  });
  const address = server.address();
  const port = typeof address === "object" && address ? address.port : opts.port;

  const queuedForIngest = () => outgoing.size(ingestId);
  const ingestConnected = () => [...clients].some((c) => c.id === ingestId && !c.closed);

  let closing: Promise<void> | null = null;
  const close = () =>
    (closing ??= (async () => {
      server.close();
      directory.stop();
      // Devices and other services go first, so nothing new arrives while the ingest drains.
      for (const c of clients) if (c.id !== ingestId) c.close();
      const deadline = Date.now() + opts.drainMs;
      let left = queuedForIngest();
      while (left > 0 && ingestConnected() && Date.now() < deadline) {
        await new Promise((r) => setTimeout(r, 50));
        left = queuedForIngest();
      }
      if (opts.stateFile) {
        const saved = await saveState(opts.stateFile, persistence, [ingestId]);
        log.info(`saved ${saved.retained} retained and ${saved.queued} queued messages to ${opts.stateFile}`);
      } else if (left > 0) {
        log.warn(`${left} messages queued for ${ingestId} are dropped (no BROKER_STATE_FILE)`);
      }
      await new Promise<void>((resolve) => broker.close(() => resolve()));
    })());

  return { port, close };
}

/**
 * aedes writes every packet on its own; at thousands of messages a second the syscalls alone
 * cost more than the routing. Corking the socket for the rest of the event-loop turn on its
 * first write sends what that turn produced in one writev. Backpressure is untouched: each
 * write still returns what the socket's own write returns.
 */
function coalesceWrites(socket: net.Socket): void {
  const write = socket.write.bind(socket) as (...args: unknown[]) => boolean;
  let corked = false;
  socket.write = ((...args: unknown[]) => {
    if (!corked && !socket.destroyed) {
      corked = true;
      socket.cork();
      setImmediate(() => {
        corked = false;
        socket.uncork();
      });
    }
    return write(...args);
  }) as typeof socket.write;
}

function remoteHost(client: Client): string {
  return (client.conn as Partial<net.Socket>).remoteAddress ?? "unknown";
}

function remoteAddress(client: Client): string {
  const conn = client.conn as Partial<net.Socket>;
  return conn.remoteAddress ? `${conn.remoteAddress}:${conn.remotePort}` : "unknown address";
}
