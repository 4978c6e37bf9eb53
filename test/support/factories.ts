// Test data made straight in the database, each shop with unique names so suites never collide.
import { randomUUID } from "node:crypto";
import { generateIdFromEntropySize } from "lucia";
import request from "supertest";
import type { Server } from "node:http";
import * as t from "../../db/schema";
import { getDb } from "~/db.server";
import type { Role } from "~/lib/permissions";
import { hashPassword } from "~/password.server";

export const TEST_PASSWORD = "a-long-test-password-1";
let hashed: Promise<string> | undefined;

export type TestUser = { id: string; email: string; role: Role; password: string };
export type TestShop = { id: string; name: string; users: Record<Role, TestUser> };

/** A shop with one person per role. */
export async function createShop(label = "Test shop"): Promise<TestShop> {
  hashed ??= hashPassword(TEST_PASSWORD);
  const passwordHash = await hashed;
  const tag = randomUUID().slice(0, 8);
  const [shop] = await getDb().insert(t.shops).values({ name: `${label} ${tag}` }).returning();
  const roles: Role[] = ["owner", "planner", "sawyer", "bookkeeper"];
  const users = {} as Record<Role, TestUser>;
  for (const role of roles) {
    const user = { id: generateIdFromEntropySize(10), email: `${role}-${tag}@shop.test`, role, password: TEST_PASSWORD };
    await getDb().insert(t.users).values({ id: user.id, shopId: shop.id, email: user.email, name: `${role} ${tag}`, role, passwordHash });
    users[role] = user;
  }
  return { id: shop.id, name: shop.name, users };
}

/** Signs in through the real form and returns the session cookie ("name=value"). */
export async function signIn(server: Server, user: { email: string; password: string }): Promise<string> {
  const res = await request(server).post("/sign-in").type("form").send({ email: user.email, password: user.password });
  if (res.status !== 302) throw new Error(`sign-in of ${user.email} answered ${res.status}: ${res.text.slice(0, 300)}`);
  return sessionCookie(res.headers["set-cookie"]);
}

export function sessionCookie(setCookie: string[] | string | undefined): string {
  const list = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : [];
  const cookie = list.find((c) => c.startsWith("stopwise_session="));
  if (!cookie) throw new Error(`no session cookie in ${JSON.stringify(list)}`);
  return cookie.split(";")[0];
}
