import { eq } from "drizzle-orm";
import request from "supertest";
import { describe, expect, it } from "vitest";
import { invitations, sessions, users } from "../../db/schema";
import { appServer } from "../support/app";
import { createShop, sessionCookie, signIn, TEST_PASSWORD } from "../support/factories";
import { createSessionCookie } from "~/auth.server";
import { getDb } from "~/db.server";

const server = await appServer();
const unique = () => Math.random().toString(36).slice(2, 10);

describe("sign-up", () => {
  it("creates a shop and its first owner, and signs them in", async () => {
    const email = `founder-${unique()}@shop.test`;
    const res = await request(server)
      .post("/sign-up")
      .type("form")
      .send({ shopName: "Birchwick Signs", name: "Ada Founder", email, password: "three rivers meet here", confirm: "three rivers meet here" });
    expect(res.status).toBe(302);
    const cookie = sessionCookie(res.headers["set-cookie"]);
    const [user] = await getDb().select().from(users).where(eq(users.email, email));
    expect(user.role).toBe("owner");
    expect(user.passwordHash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/); // OWASP Password Storage Cheat Sheet parameters

    const home = await request(server).get("/").set("Cookie", cookie);
    expect(home.status).toBe(200);
    expect(home.text).toContain("Birchwick Signs");
  });

  it.each([
    ["password", "short pass1", "at least 12"], // ASVS 4.0.3 V2.1.1
    ["password", "x".repeat(129), "at most 128"], // ASVS 4.0.3 V2.1.2
    ["password", "password1234", "most common"], // ASVS 4.0.3 V2.1.7
    ["email", "not-an-address", "valid e-mail"],
  ])("names the field %s when it is wrong (%s)", async (field, value, message) => {
    const body = { shopName: "Shop", name: "Name", email: `a-${unique()}@shop.test`, password: "a perfectly fine phrase", confirm: "a perfectly fine phrase", [field]: value };
    if (field === "password") body.confirm = value;
    const res = await request(server).post("/sign-up").type("form").send(body);
    expect(res.status).toBe(400);
    expect(res.text).toContain(message);
    expect(res.text).toContain(`field-${field}-error`);
  });

  it("accepts a 64-character password with spaces and accents unchanged (ASVS 4.0.3 V2.1.2–V2.1.4)", async () => {
    const password = "Zoë and Nguyễn cut the birch — thirty-two table numbers, no less!".slice(0, 64);
    const email = `long-${unique()}@shop.test`;
    const res = await request(server).post("/sign-up").type("form").send({ shopName: "S", name: "N", email, password, confirm: password });
    expect(res.status).toBe(302);
    await expect(signIn(server, { email, password })).resolves.toMatch(/^stopwise_session=/);
    await expect(signIn(server, { email, password: password.slice(0, 63) })).rejects.toThrow(/answered 400/);
  });

  it("refuses a second account with the same e-mail, in any letter case", async () => {
    const shop = await createShop();
    const res = await request(server)
      .post("/sign-up")
      .type("form")
      .send({ shopName: "Copy", name: "Copy", email: shop.users.owner.email.toUpperCase(), password: "another fine phrase", confirm: "another fine phrase" });
    expect(res.status).toBe(400);
    expect(res.text).toContain("already exists");
  });
});

describe("sign-in and sessions", () => {
  it("sets the session cookie HttpOnly, SameSite=Lax, Path=/, with an expiry, not Secure over http (ASVS 4.0.3 V3.4.2, V3.4.3, V3.4.5)", async () => {
    const shop = await createShop();
    const res = await request(server).post("/sign-in").type("form").send({ email: shop.users.planner.email, password: TEST_PASSWORD });
    expect(res.status).toBe(302);
    const header = [res.headers["set-cookie"]].flat().find((c: string) => c.startsWith("stopwise_session="))!;
    expect(header).toMatch(/HttpOnly/i);
    expect(header).toMatch(/SameSite=Lax/i);
    expect(header).toMatch(/Path=\//);
    expect(header).toMatch(/Max-Age=43200|Expires=/); // twelve hours
    expect(header).not.toMatch(/Secure/i);
    const token = header.split(";")[0].split("=")[1];
    expect(token.length).toBeGreaterThanOrEqual(16); // ≥ 80 bits of entropy in lucia's id (ASVS 4.0.3 V3.2.2)
  });

  it("marks the cookie Secure when served over https (ASVS 4.0.3 V3.4.1)", async () => {
    const shop = await createShop();
    const cookie = await createSessionCookie(shop.users.owner.id, new Request("https://stopwise.example/sign-in"));
    expect(cookie).toMatch(/; Secure/);
  });

  it("starts a new session on sign-in and ends the one the browser carried (no fixation, ASVS 4.0.3 V3.2.1)", async () => {
    const shop = await createShop();
    const first = await signIn(server, shop.users.sawyer);
    const res = await request(server).post("/sign-in").set("Cookie", first).type("form").send({ email: shop.users.sawyer.email, password: TEST_PASSWORD });
    const second = sessionCookie(res.headers["set-cookie"]);
    expect(second).not.toBe(first);
    const old = await request(server).get("/saw").set("Cookie", first);
    expect(old.status).toBe(302);
    expect((await request(server).get("/saw").set("Cookie", second)).status).toBe(200);
  });

  it("gives the same answer for a wrong password and an unknown e-mail", async () => {
    const shop = await createShop();
    const wrong = await request(server).post("/sign-in").type("form").send({ email: shop.users.owner.email, password: "not the password at all" });
    const unknown = await request(server).post("/sign-in").type("form").send({ email: `nobody-${unique()}@shop.test`, password: "not the password at all" });
    expect(wrong.status).toBe(400);
    expect(unknown.status).toBe(400);
    const message = (html: string) => /role="alert"[^>]*>([^<]+)</.exec(html)?.[1];
    expect(message(wrong.text)).toBeTruthy();
    expect(message(wrong.text)).toBe(message(unknown.text));
  });

  it("sign-out ends the session on the server (ASVS 4.0.3 V3.3.1)", async () => {
    const shop = await createShop();
    const cookie = await signIn(server, shop.users.bookkeeper);
    const out = await request(server).post("/sign-out").set("Cookie", cookie);
    expect(out.status).toBe(302);
    expect(out.headers.location).toBe("/sign-in");
    const again = await request(server).get("/ledger").set("Cookie", cookie);
    expect(again.status).toBe(302);
    expect(again.headers.location).toBe("/sign-in?redirectTo=%2Fledger");
  });

  it("renews a session past half its lifetime with a new expiry (sliding), and drops an expired one", async () => {
    const shop = await createShop();
    const cookie = await signIn(server, shop.users.owner);
    const id = cookie.split("=")[1];
    const soon = new Date(Date.now() + 60 * 60 * 1000); // one hour left of twelve
    await getDb().update(sessions).set({ expiresAt: soon }).where(eq(sessions.id, id));
    const res = await request(server).get("/").set("Cookie", cookie);
    expect(res.status).toBe(200);
    expect(sessionCookie(res.headers["set-cookie"])).toBe(cookie); // same id, new expiry
    const [row] = await getDb().select().from(sessions).where(eq(sessions.id, id));
    expect(row.expiresAt.getTime()).toBeGreaterThan(Date.now() + 11 * 60 * 60 * 1000);

    await getDb().update(sessions).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(sessions.id, id));
    const expired = await request(server).get("/").set("Cookie", cookie);
    expect(expired.status).toBe(302);
    expect([expired.headers["set-cookie"]].flat().join()).toMatch(/stopwise_session=;/);
  });

  it("ends a session 12 hours after sign-in however active it is (ASVS 4.0.3 V3.3.2)", async () => {
    const shop = await createShop();
    const cookie = await signIn(server, shop.users.owner);
    const id = cookie.split("=")[1];
    const elevenHoursAgo = new Date(Date.now() - 11 * 60 * 60 * 1000);
    await getDb().update(sessions).set({ createdAt: elevenHoursAgo }).where(eq(sessions.id, id));
    expect((await request(server).get("/").set("Cookie", cookie)).status).toBe(200);

    await getDb().update(sessions).set({ createdAt: new Date(Date.now() - 12 * 60 * 60 * 1000 - 1000), expiresAt: new Date(Date.now() + 6 * 60 * 60 * 1000) }).where(eq(sessions.id, id));
    const ended = await request(server).get("/orders").set("Cookie", cookie);
    expect(ended.status).toBe(302);
    expect(ended.headers.location).toBe("/sign-in?redirectTo=%2Forders");
    expect([ended.headers["set-cookie"]].flat().join()).toMatch(/stopwise_session=;/);
    expect(await getDb().select().from(sessions).where(eq(sessions.id, id))).toHaveLength(0);
  });

  it("returns to the address it was sent from, but never off-site", async () => {
    const shop = await createShop();
    const ok = await request(server).post("/sign-in").type("form").send({ email: shop.users.owner.email, password: TEST_PASSWORD, redirectTo: "/team" });
    expect(ok.headers.location).toBe("/team");
    const evil = await request(server).post("/sign-in").type("form").send({ email: shop.users.owner.email, password: TEST_PASSWORD, redirectTo: "//evil.example/x" });
    expect(evil.headers.location).toBe("/");
  });
});

describe("cross-site request forgery (ASVS 4.0.3 V4.2.2, V13.2.3)", () => {
  it("refuses a form post whose Origin is another site, and one whose Sec-Fetch-Site says cross-site", async () => {
    const shop = await createShop();
    const cookie = await signIn(server, shop.users.owner);
    const email = `forged-${Math.random().toString(36).slice(2)}@shop.test`;
    const foreign = await request(server).post("/team").set("Cookie", cookie).set("Origin", "http://evil.example").type("form").send({ intent: "invite", email, role: "sawyer" });
    // React Router's own origin check answers 400 before ours would answer 403; either way nothing happens.
    expect([400, 403]).toContain(foreign.status);
    expect(await getDb().select().from(invitations).where(eq(invitations.email, email))).toHaveLength(0);
    const forgedFetch = await request(server).post("/team").set("Cookie", cookie).set("Sec-Fetch-Site", "same-site").type("form").send({ intent: "invite", email, role: "sawyer" });
    expect(forgedFetch.status).toBe(403);
    expect(forgedFetch.text).toContain("came from another site");
    expect(await getDb().select().from(invitations).where(eq(invitations.email, email))).toHaveLength(0);
    const crossSite = await request(server).post("/sign-out").set("Cookie", cookie).set("Sec-Fetch-Site", "cross-site");
    expect(crossSite.status).toBe(403);
    // The session survived both.
    expect((await request(server).get("/team").set("Cookie", cookie)).status).toBe(200);
  });

  it("lets a same-origin post through", async () => {
    const shop = await createShop();
    const cookie = await signIn(server, shop.users.owner);
    const res = await request(server).post("/sign-out").set("Cookie", cookie).set("Sec-Fetch-Site", "same-origin");
    expect(res.status).toBe(302);
  });
});

describe("response headers (ASVS 4.0.3 V14.4.3–V14.4.7)", () => {
  it("pages say nosniff, same-origin referrers, and may not be framed", async () => {
    const res = await request(server).get("/sign-in");
    expect(res.headers["x-content-type-options"]).toBe("nosniff");
    expect(res.headers["referrer-policy"]).toBe("same-origin");
    expect(res.headers["x-frame-options"]).toBe("DENY");
    expect(res.headers["content-security-policy"]).toContain("frame-ancestors 'none'");
    expect(res.headers["content-type"]).toBe("text/html; charset=utf-8");
  });

  it("scripts run only from this origin or with a nonce that is new on every response and on every inline script", async () => {
    const nonces: string[] = [];
    for (let i = 0; i < 3; i++) {
      const res = await request(server).get("/sign-in");
      const csp: string = res.headers["content-security-policy"];
      const scriptSrc = csp.split(";").map((d) => d.trim()).find((d) => d.startsWith("script-src "));
      expect(scriptSrc).toMatch(/^script-src 'self' 'nonce-[A-Za-z0-9+/]{22}==' *$/);
      expect(csp).not.toContain("unsafe-inline");
      const nonce = scriptSrc!.match(/'nonce-([^']+)'/)![1];
      nonces.push(nonce);
      // Every script tag in the page, inline or not, carries this response's nonce.
      const scripts = [...res.text.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/g)];
      const inline = scripts.filter(([, , body]) => body.trim() !== "");
      expect(inline.length).toBeGreaterThanOrEqual(2); // hydration context and route modules, at least
      for (const [tag, attrs] of scripts) expect(attrs, tag.slice(0, 120)).toContain(`nonce="${nonce}"`);
    }
    expect(new Set(nonces).size).toBe(3);
  });
});

describe("changing one's own password (ASVS 4.0.3 V2.1.5, V2.1.6, V3.3.3)", () => {
  const NEW = "lantern moss over the weir";
  const change = (cookie: string, fields: Record<string, string>, address = `10.9.${Math.floor(Math.random() * 250)}.1`) =>
    request(server).post("/account").set("Cookie", cookie).set("x-stopwise-client-address", address).type("form").send({ intent: "password", ...fields });
  const signInAs = (email: string, password: string) => request(server).post("/sign-in").type("form").send({ email, password });

  it("asks for the current password, names each bad field, and then ends every other session", async () => {
    const shop = await createShop("Account");
    const me = shop.users.sawyer;
    const here = await signIn(server, me);
    const elsewhere = await signIn(server, me); // the same person on the saw's tablet

    expect((await request(server).get("/").set("Cookie", here)).text).toContain('href="/account"'); // from every page's person card
    const page = await request(server).get("/account").set("Cookie", here);
    expect(page.status).toBe(200);
    expect(page.text).toContain(me.email);

    const wrong = await change(here, { current: "not my password at all", password: NEW, confirm: NEW });
    expect(wrong.status).toBe(400);
    expect(wrong.text).toMatch(/id="field-current-error"[^>]*>That is not your current password\./);
    const cases: [Record<string, string>, string, RegExp][] = [
      [{ current: me.password, password: "short one", confirm: "short one" }, "password", /at least 12/],
      [{ current: me.password, password: NEW, confirm: `${NEW}!` }, "confirm", /The two new passwords differ/],
      [{ current: me.password, password: me.password, confirm: me.password }, "password", /other than the one you have now/],
      [{ current: "", password: NEW, confirm: NEW }, "current", /Enter your current password/],
    ];
    for (const [fields, field, message] of cases) {
      const res = await change(here, fields);
      expect(res.status, field).toBe(400);
      expect(res.text).toContain(`field-${field}-error`);
      expect(res.text).toMatch(message);
    }
    expect((await signInAs(me.email, me.password)).status).toBe(302); // nothing changed yet

    const done = await change(here, { current: me.password, password: NEW, confirm: NEW });
    expect(done.status).toBe(302);
    expect(done.headers.location).toBe("/account?password=changed");
    const fresh = sessionCookie(done.headers["set-cookie"]);
    expect((await request(server).get("/account").set("Cookie", here)).status).toBe(302); // this browser's old session ended too
    expect((await request(server).get("/").set("Cookie", elsewhere)).status).toBe(302); // and the tablet's
    const after = await request(server).get("/account?password=changed").set("Cookie", fresh);
    expect(after.status).toBe(200);
    expect(after.text).toContain("Password changed. You are signed out everywhere else");
    expect((await signInAs(me.email, me.password)).status).toBe(400);
    expect((await signInAs(me.email, NEW)).status).toBe(302);
  });

  it("renames oneself, refusing an empty name on its field; an unknown action changes nothing", async () => {
    const shop = await createShop("Account name");
    const me = shop.users.bookkeeper;
    const cookie = await signIn(server, me);
    const rename = (fields: Record<string, string>) => request(server).post("/account").set("Cookie", cookie).type("form").send(fields);
    const blank = await rename({ intent: "name", name: "   " });
    expect(blank.status).toBe(400);
    expect(blank.text).toMatch(/id="field-name-error"[^>]*>Enter a name\./);
    expect((await rename({ intent: "shred", name: "Someone else" })).text).toMatch(/role="alert"[^>]*>Unknown action\./);
    expect((await getDb().select({ name: users.name }).from(users).where(eq(users.id, me.id)))[0].name).toBe(`bookkeeper ${shop.name.split(" ").pop()}`);
    const saved = await rename({ intent: "name", name: "  Tobiah Vance  " });
    expect(saved.status).toBe(302);
    expect(saved.headers.location).toBe("/account?name=saved");
    const [row] = await getDb().select({ name: users.name }).from(users).where(eq(users.id, me.id));
    expect(row.name).toBe("Tobiah Vance");
    const page = await request(server).get("/account?name=saved").set("Cookie", cookie);
    expect(page.text).toContain("Name saved.");
    expect(page.text).toContain("Tobiah Vance"); // the person card reads the name afresh
  });

  it("counts a wrong current password as a failed sign-in: ten, and the account waits", async () => {
    const shop = await createShop("Account guess");
    const me = shop.users.planner;
    const cookie = await signIn(server, me);
    for (let i = 0; i < 10; i++) expect((await change(cookie, { current: `guess number ${i} here`, password: NEW, confirm: NEW }, `10.8.0.${i}`)).status).toBe(400);
    const blocked = await change(cookie, { current: me.password, password: NEW, confirm: NEW }, "10.8.1.1");
    expect(blocked.status).toBe(429);
    expect(blocked.text).toContain("Too many wrong passwords");
    expect(Number(blocked.headers["retry-after"])).toBeGreaterThan(0);
    expect((await signInAs(me.email, me.password)).status).toBe(429); // sign-in shares the count
  });
});
