import request from "supertest";
import { describe, expect, it } from "vitest";
import { appServer } from "../support/app";
import { createShop, TEST_PASSWORD } from "../support/factories";

const server = await appServer();
const attempt = (email: string, password: string, address: string) =>
  request(server).post("/sign-in").set("x-stopwise-client-address", address).type("form").send({ email, password });

// OWASP ASVS 4.0.3 V2.2.1: anti-automation, at most 100 failed attempts per hour on one account.
describe("sign-in rate limits", () => {
  it("blocks an account after 10 failures, even with the right password, with a clear message", async () => {
    const shop = await createShop();
    const email = shop.users.planner.email;
    for (let i = 0; i < 10; i++) expect((await attempt(email, "wrong password here", `10.0.0.${i}`)).status).toBe(400);
    const blocked = await attempt(email, TEST_PASSWORD, "10.0.1.1");
    expect(blocked.status).toBe(429);
    expect(blocked.text).toContain("Too many sign-in attempts");
    expect(Number(blocked.headers["retry-after"])).toBeGreaterThan(0);
  });

  it("answers an unknown e-mail exactly like a known one once blocked", async () => {
    const ghost = `ghost-${Math.random().toString(36).slice(2)}@shop.test`;
    for (let i = 0; i < 10; i++) await attempt(ghost, "wrong password here", `10.1.0.${i}`);
    const blocked = await attempt(ghost, "wrong password here", "10.1.1.1");
    expect(blocked.status).toBe(429);
    expect(blocked.text).toContain("Too many sign-in attempts");
  });

  it("blocks an address after 30 failures across accounts", async () => {
    const address = `10.2.${Math.floor(Math.random() * 250)}.9`;
    for (let i = 0; i < 30; i++) await attempt(`spray-${i}-${address}@shop.test`, "wrong password here", address);
    const shop = await createShop();
    const blocked = await attempt(shop.users.owner.email, TEST_PASSWORD, address);
    expect(blocked.status).toBe(429);
    const elsewhere = await attempt(shop.users.owner.email, TEST_PASSWORD, "10.3.0.1");
    expect(elsewhere.status).toBe(302);
  });
});
