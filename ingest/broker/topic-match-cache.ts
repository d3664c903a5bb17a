// aedes matches every QoS 1 publish's topic against the subscriptions twice: in its message router
// (mqemitter, for the connected subscribers) and in its persistence (for the sessions to queue it
// for, the ingest's). Each match splits the topic into words and walks a trie, a few per cent of the
// broker's CPU at full rate. Topics repeat (a controller publishes on one topic) and subscriptions
// change rarely, so both answers are kept per topic and dropped whenever any subscription changes.
// Nothing reads these answers but to iterate them, so one array may serve many publishes.

/** Answers per topic; never more than `MAX_TOPICS` (a flood of new topics only empties it). */
export class TopicAnswers<T> {
  static readonly MAX_TOPICS = 10_000;
  private readonly byTopic = new Map<string, T>();

  get(topic: string, compute: (topic: string) => T): T {
    let answer = this.byTopic.get(topic);
    if (answer === undefined) {
      if (this.byTopic.size >= TopicAnswers.MAX_TOPICS) this.byTopic.clear();
      answer = compute(topic);
      this.byTopic.set(topic, answer);
    }
    return answer;
  }

  clear(): void {
    this.byTopic.clear();
  }
}

interface Matcher {
  match(topic: string): unknown;
  add(...args: unknown[]): unknown;
  remove(...args: unknown[]): unknown;
}

/** Caches the router's matches (aedes' `broker.mq`, an mqemitter, and its Qlobber `_matcher`). */
export function cacheRouterMatches(mq: unknown): void {
  const matcher = (mq as { _matcher?: Partial<Matcher> } | null)?._matcher;
  if (!matcher || typeof matcher.match !== "function" || typeof matcher.add !== "function" || typeof matcher.remove !== "function") {
    throw new Error("mqemitter internals changed: its _matcher has no match, add and remove; the topic cache cannot work");
  }
  const match = matcher.match.bind(matcher);
  const add = matcher.add.bind(matcher);
  const remove = matcher.remove.bind(matcher);
  const answers = new TopicAnswers<unknown>();
  matcher.match = (topic: string) => answers.get(topic, match);
  matcher.add = (...args: unknown[]) => {
    answers.clear();
    return add(...args);
  };
  matcher.remove = (...args: unknown[]) => {
    answers.clear();
    return remove(...args);
  };
}

type Method = (...args: never[]) => Promise<unknown>;

/**
 * Persistence methods that cache `subscriptionsByTopic` of `persistence` and drop the cache on
 * every subscription change (to use as overrides, see ./outgoing-store.ts `withOverrides`).
 */
export function cachedSubscriptions(persistence: Record<string, unknown>): Record<string, Method> {
  const original = (name: string) => {
    const fn = persistence[name];
    if (typeof fn !== "function") throw new Error(`aedes-persistence has no ${name}; the topic cache cannot work`);
    return (fn as (...args: unknown[]) => Promise<unknown>).bind(persistence);
  };
  const byTopic = original("subscriptionsByTopic");
  const answers = new TopicAnswers<Promise<unknown>>();
  const lookUp = (topic: string) => {
    const answer = byTopic(topic);
    answer.catch(() => answers.clear()); // a lookup that failed is not kept
    return answer;
  };
  // Looked up and bound once, so a persistence without them fails at start, not at a subscribe.
  const changing = (name: string): Method => {
    const change = original(name);
    return (...args) => {
      answers.clear();
      return change(...args).finally(() => answers.clear());
    };
  };
  return {
    subscriptionsByTopic: ((topic: string) => answers.get(topic, lookUp)) as Method,
    addSubscriptions: changing("addSubscriptions"),
    removeSubscriptions: changing("removeSubscriptions"),
    cleanSubscriptions: changing("cleanSubscriptions"),
  };
}
