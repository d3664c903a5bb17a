// A lean load generator: one MQTT connection per seeded controller (with its own credentials)
// publishing QoS 1 raw messages of the controller's three samples, timestamps 1 ms apart so
// every row is distinct. The simulator's physics is left out: the bench measures the pipeline.
//
// The loop is closed end to end: it listens to the live reading stream (as svc-web) and keeps
// at most `maxOutstanding` samples published but not yet committed (enough for the ingest's
// time-sized batches at the rates aimed at), so the rate it settles at
// is what the whole chain sustains, with the broker's queue bounded instead of growing forever.
import mqtt, { type MqttClient } from "mqtt";
import { readingBatch, type RawMessage } from "../../ingest/payloads";
import { deviceClientId, SERVICE_ACCOUNTS, serviceClientId, topics } from "../../ingest/topics";

export interface PublisherTarget {
  controllerId: string;
  username: string;
  password: string;
  serials: string[];
}

export class LoadPublisher {
  private clients: MqttClient[] = [];
  private running = false;
  private parked: (() => void)[] = [];
  published = 0;
  streamed = 0;

  constructor(
    private readonly url: string,
    private readonly targets: PublisherTarget[],
    private readonly opts = { windowPerConnection: 100, maxOutstanding: 30_000, startTs: Date.now() - 120_000 },
  ) {}

  private connect(options: mqtt.IClientOptions): Promise<MqttClient> {
    return new Promise((resolve, reject) => {
      const client = mqtt.connect(this.url, { clean: true, reconnectPeriod: 0, ...options });
      client.once("connect", () => resolve(client));
      client.once("error", reject);
      this.clients.push(client);
    });
  }

  async start(): Promise<void> {
    this.running = true;
    const stream = await this.connect({ ...credentialsOf("web"), clientId: serviceClientId("web", `bench-${process.pid}`) });
    stream.on("message", (_topic, payload) => {
      const batch = readingBatch.safeParse(JSON.parse(payload.toString("utf8")));
      if (batch.success) this.streamed += batch.data.readings.length;
      const parked = this.parked;
      this.parked = [];
      for (const resume of parked) resume();
    });
    await stream.subscribeAsync(topics.readingWildcard, { qos: 0 });

    await Promise.all(
      this.targets.map(async (t, i) => {
        const client = await this.connect({ username: t.username, password: t.password, clientId: deviceClientId(t.controllerId, `bench-${process.pid}-${i}`) });
        const topic = topics.raw(t.controllerId);
        let seq = 0;
        let ts = this.opts.startTs;
        const sendOne = () => {
          if (!this.running) return;
          if (this.published - this.streamed > this.opts.maxOutstanding) {
            this.parked.push(sendOne); // resumes when the stream shows commits
            return;
          }
          ts++;
          const message: RawMessage = { v: 1, seq: seq++, samples: t.serials.map((serial, k) => ({ serial, ts, signal: k === 2 ? 20.5 : 40 + (ts % 7) })) };
          this.published += message.samples.length;
          client.publish(topic, JSON.stringify(message), { qos: 1 }, () => sendOne());
        };
        for (let k = 0; k < this.opts.windowPerConnection; k++) sendOne();
      }),
    );
  }

  async stop(): Promise<void> {
    this.running = false;
    await Promise.all(this.clients.map((c) => new Promise<void>((resolve) => c.end(false, {}, () => resolve()))));
  }
}

function credentialsOf(account: "web") {
  return { username: SERVICE_ACCOUNTS[account].username, password: SERVICE_ACCOUNTS[account].password() };
}
