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
});
