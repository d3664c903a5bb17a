// The embedded broker keeps its two topic lookups per topic until a subscription changes. Checked
// here on the same router (mqemitter) and persistence (aedes-persistence) that aedes uses.
import { describe, expect, it } from "vitest";
import mqemitter from "mqemitter";
import memoryPersistence from "aedes-persistence";
import { cachedSubscriptions, cacheRouterMatches, TopicAnswers } from "@/ingest/broker/topic-match-cache";

const tick = () => new Promise((r) => setImmediate(r));

describe("the broker's topic match cache", () => {
  it("routes to listeners added and removed after a topic was matched", async () => {
    const mq = mqemitter();
    cacheRouterMatches(mq);
    const heard: string[] = [];
    const wide = (m: { topic: string }, done: () => void) => (heard.push(`wide ${m.topic}`), done());
    const narrow = (m: { topic: string }, done: () => void) => (heard.push(`narrow ${m.topic}`), done());
    const emit = (topic: string) => new Promise<void>((r) => mq.emit({ topic }, () => r()));
    mq.on("tw/v1/dev/+/raw", wide);
    await emit("tw/v1/dev/a/raw");
    mq.on("tw/v1/dev/a/raw", narrow);
    await emit("tw/v1/dev/a/raw");
    mq.removeListener("tw/v1/dev/+/raw", wide);
    await tick();
    await emit("tw/v1/dev/a/raw");
    await emit("tw/v1/dev/b/raw");
    // Listeners of one message in any order: the counts tell.
    expect(heard.sort()).toEqual(["narrow tw/v1/dev/a/raw", "narrow tw/v1/dev/a/raw", "wide tw/v1/dev/a/raw", "wide tw/v1/dev/a/raw"]);
  });

  it("finds the sessions to queue for as subscriptions come and go", async () => {
    const persistence = memoryPersistence() as unknown as Record<string, (...args: unknown[]) => Promise<unknown>>;
    const cached = { ...persistence, ...cachedSubscriptions(persistence) } as Record<string, (...args: unknown[]) => Promise<unknown>>;
    const who = async (topic: string) => ((await cached.subscriptionsByTopic(topic)) as { clientId: string }[]).map((s) => s.clientId).sort();
    await cached.addSubscriptions.call(persistence, { id: "ingest" }, [{ topic: "tw/v1/dev/+/raw", qos: 1 }]);
    expect(await who("tw/v1/dev/a/raw")).toEqual(["ingest"]);
    await cached.addSubscriptions.call(persistence, { id: "other" }, [{ topic: "tw/v1/dev/a/raw", qos: 1 }]);
    expect(await who("tw/v1/dev/a/raw")).toEqual(["ingest", "other"]);
    await cached.removeSubscriptions.call(persistence, { id: "other" }, ["tw/v1/dev/a/raw"]);
    expect(await who("tw/v1/dev/a/raw")).toEqual(["ingest"]);
    await cached.cleanSubscriptions.call(persistence, { id: "ingest" });
    expect(await who("tw/v1/dev/a/raw")).toEqual([]);
  });

  it("holds at most its limit of topics", () => {
    const answers = new TopicAnswers<number>();
    let computed = 0;
    for (let i = 0; i < TopicAnswers.MAX_TOPICS + 5; i++) answers.get(`t/${i}`, () => ++computed);
    expect(answers.get("t/0", () => -1)).toBe(-1); // dropped when the limit was reached
    expect(answers.get(`t/${TopicAnswers.MAX_TOPICS + 4}`, () => -1)).toBe(TopicAnswers.MAX_TOPICS + 5);
  });
});
