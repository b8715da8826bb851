import { describe, expect, it } from "vitest";
import { loadConfig } from "../../../server/config/env";

describe("loadConfig", () => {
  it("has loopback defaults and derives the public origin", () => {
    const c = loadConfig({});
    expect(c.host).toBe("127.0.0.1");
    expect(c.publicOrigin).toBe("http://127.0.0.1:5180");
    expect(c.smtp.host).toBeUndefined();
  });

  it("lists every bad variable in one message", () => {
    expect(() => loadConfig({ LOTWISE_PORT: "99999", LOTWISE_DB_NAME: "drop;table" })).toThrow(
      /LOTWISE_PORT: .*65535[\s\S]*LOTWISE_DB_NAME: letters, digits and _ only/,
    );
  });

  it("is embedded unless a Redis URL is set, and checks that URL", () => {
    expect(loadConfig({}).redisUrl).toBeUndefined();
    expect(loadConfig({ LOTWISE_REDIS_URL: "  " }).redisUrl).toBeUndefined();
    const c = loadConfig({ LOTWISE_REDIS_URL: "redis://10.0.0.5:6390/", LOTWISE_REDIS_OUTAGE_S: "30" });
    expect(c).toMatchObject({ redisUrl: "redis://10.0.0.5:6390/", redisOutageSeconds: 30, noWorkersSeconds: 600 });
    expect(loadConfig({ LOTWISE_REDIS_URL: "rediss://lotwise:pw@redis.example:6380/" }).redisUrl).toBe("rediss://lotwise:pw@redis.example:6380/");
    expect(() => loadConfig({ LOTWISE_REDIS_URL: "http://10.0.0.5:6390/" })).toThrow(/LOTWISE_REDIS_URL: must start with redis:\/\/ or rediss:\/\//);
    expect(() => loadConfig({ LOTWISE_REDIS_URL: "10.0.0.5:6390" })).toThrow(/LOTWISE_REDIS_URL: must/);
    expect(() => loadConfig({ LOTWISE_NO_WORKERS_S: "0" })).toThrow(/LOTWISE_NO_WORKERS_S/);
  });
});
