import { describe, expect, it } from "vitest";
import { RateLimiter } from "../../../app/services/rate-limit.server";

/** The fixed-window counter behind the sign-in limits (one per e-mail, one per client address). */
describe("RateLimiter", () => {
  it("allows `limit` attempts per key and window, then refuses until the window ends", () => {
    const limiter = new RateLimiter(3, 60_000);
    const t0 = 1_000_000;
    expect([1, 2, 3].map((i) => limiter.take("10.0.0.1", t0 + i))).toEqual([true, true, true]);
    expect(limiter.take("10.0.0.1", t0 + 4)).toBe(false);
    expect(limiter.retryAfterSeconds("10.0.0.1", t0 + 4)).toBe(60);
    expect(limiter.take("10.0.0.1", t0 + 60_001)).toBe(true); // a new window
  });

  it("counts each key on its own, so one address cannot use up another's attempts", () => {
    const limiter = new RateLimiter(2, 60_000);
    limiter.take("10.0.0.1", 0);
    limiter.take("10.0.0.1", 1);
    expect(limiter.take("10.0.0.1", 2)).toBe(false);
    expect(limiter.take("10.0.0.2", 3)).toBe(true);
  });

  it("forgets a key on reset (a successful sign-in clears its e-mail's count)", () => {
    const limiter = new RateLimiter(1, 60_000);
    limiter.take("a@demo.test", 0);
    expect(limiter.take("a@demo.test", 1)).toBe(false);
    limiter.reset("a@demo.test");
    expect(limiter.take("a@demo.test", 2)).toBe(true);
    expect(limiter.retryAfterSeconds("never-seen", 0)).toBe(0);
  });
});
