// One live stream's outgoing bytes. The response pulls (it asks for more only once the socket has
// taken the last write), and each pull writes everything waiting in one chunk: a client that reads
// slowly gets fewer, larger writes instead of a growing queue of small ones, and what waits is a
// list of references to chunks encoded once for every client, not copies.
const COALESCE_MS = 25;

/** Live readings wait for one shared timer, so a thousand streams write together, once per tick. */
let due: (() => void)[] = [];
function onNextTick(run: () => void) {
  if (due.length === 0) {
    setTimeout(() => {
      const now = due;
      due = [];
      for (const f of now) f();
    }, COALESCE_MS);
  }
  due.push(run);
}

function concat(chunks: Uint8Array[]): Uint8Array {
  let length = 0;
  for (const c of chunks) length += c.length;
  const out = new Uint8Array(length);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

export class Outbox {
  readonly stream: ReadableStream<Uint8Array>;
  private controller!: ReadableStreamDefaultController<Uint8Array>;
  private chunks: Uint8Array[] = [];
  private bytes = 0;
  /** Resolves the response's pending pull, when it is waiting for bytes. */
  private wake: (() => void) | null = null;
  private ticking = false;
  /** The response has asked for more (a pull is pending). */
  private asked = false;
  private closed = false;

  /**
   * @param maxBytes bytes a client may leave unread before it is dropped (its browser reconnects
   *   and backfills from the database)
   * @param onEnd called once when the client goes away or is dropped
   */
  constructor(
    private readonly maxBytes: number,
    private readonly onEnd: () => void,
  ) {
    this.stream = new ReadableStream<Uint8Array>(
      {
        start: (controller) => {
          this.controller = controller;
        },
        pull: () => this.pull(),
        cancel: () => this.onEnd(),
      },
      { highWaterMark: 0 },
    );
  }

  /** Written at the response's next pull. */
  send(chunk: Uint8Array) {
    if (this.add(chunk)) this.write();
  }

  /** Written at the next shared tick, together with whatever else arrives until then. */
  sendSoon(chunk: Uint8Array) {
    if (!this.add(chunk) || this.ticking) return;
    this.ticking = true;
    onNextTick(this.tick);
  }

  close() {
    if (this.closed) return;
    this.closed = true;
    this.chunks = [];
    try {
      this.controller.close();
    } catch {
      /* already closed by the client */
    }
    this.wake?.();
    this.wake = null;
  }

  private add(chunk: Uint8Array): boolean {
    if (this.closed) return false;
    this.chunks.push(chunk);
    this.bytes += chunk.length;
    if (this.bytes <= this.maxBytes) return true;
    this.onEnd();
    return false;
  }

  private readonly tick = () => {
    this.ticking = false;
    this.write();
  };

  private pull(): Promise<void> | void {
    this.asked = true;
    this.write();
    if (this.asked && !this.closed) return new Promise<void>((resolve) => (this.wake = resolve));
  }

  /** Hands everything waiting to the response, if it has asked for more. */
  private write() {
    if (!this.asked || this.closed || this.chunks.length === 0) return;
    const chunks = this.chunks;
    this.chunks = [];
    this.bytes = 0;
    this.asked = false;
    try {
      this.controller.enqueue(chunks.length === 1 ? chunks[0] : concat(chunks));
    } catch {
      this.onEnd();
    }
    const wake = this.wake;
    this.wake = null;
    wake?.();
  }
}
