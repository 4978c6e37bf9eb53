import { and, eq, gt, isNull, sql } from "drizzle-orm";
import { generateIdFromEntropySize } from "lucia";
import { invitations, passwordResets, shops, users } from "../../db/schema";
import { getDb } from "~/db.server";
import type { Role } from "~/lib/permissions";
import { hashPassword, verifyPassword } from "~/password.server";
import { hashToken, newToken, RESET_LIFETIME_MS } from "~/tokens.server";

export class EmailTakenError extends Error {
  constructor() {
    super("An account with this e-mail address already exists.");
  }
}

function isUniqueViolation(error: unknown): boolean {
  const cause = (error as { cause?: { code?: string } })?.cause ?? error;
  return (cause as { code?: string })?.code === "23505";
}

export async function findUserByEmail(email: string) {
  const [user] = await getDb()
    .select({ id: users.id, passwordHash: users.passwordHash, email: users.email, name: users.name })
    .from(users)
    .where(eq(sql`lower(${users.email})`, email.toLowerCase()));
  return user ?? null;
}

// Verified even for unknown e-mails, so the time taken does not tell whether an account exists.
let dummyHash: Promise<string> | undefined;

/** The user id when e-mail and password match, else null. */
export async function checkCredentials(email: string, password: string): Promise<string | null> {
  const user = await findUserByEmail(email);
  if (!user) {
    dummyHash ??= hashPassword("not-a-real-password-for-timing");
    await verifyPassword(await dummyHash, password);
    return null;
  }
  return (await verifyPassword(user.passwordHash, password)) ? user.id : null;
}

/** A signed-in member's own password changed, when the current one is right; false when it is not. */
export async function changePassword(userId: string, current: string, next: string): Promise<boolean> {
  const [user] = await getDb().select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, userId));
  if (!user || !(await verifyPassword(user.passwordHash, current))) return false;
  await getDb().update(users).set({ passwordHash: await hashPassword(next) }).where(eq(users.id, userId));
  return true;
}

/** The name a member goes by in the shop (the team list, order histories, the person card). */
export async function renameUser(userId: string, name: string): Promise<void> {
  await getDb().update(users).set({ name }).where(eq(users.id, userId));
}

/** Sign-up: a new shop and its first owner, in one transaction. */
export async function createShopWithOwner(input: { shopName: string; name: string; email: string; password: string }) {
  const passwordHash = await hashPassword(input.password);
  try {
    return await getDb().transaction(async (tx) => {
      const [shop] = await tx.insert(shops).values({ name: input.shopName }).returning({ id: shops.id });
      const id = generateIdFromEntropySize(10);
      await tx.insert(users).values({ id, shopId: shop.id, email: input.email, name: input.name, role: "owner", passwordHash });
      return { shopId: shop.id, userId: id };
    });
  } catch (error) {
    if (isUniqueViolation(error)) throw new EmailTakenError();
    throw error;
  }
}

/** Looks up a live invitation by its token (not accepted, not expired). */
export async function findOpenInvitation(token: string) {
  const [row] = await getDb()
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, shopName: shops.name, expiresAt: invitations.expiresAt })
    .from(invitations)
    .innerJoin(shops, eq(shops.id, invitations.shopId))
    .where(and(eq(invitations.tokenHash, hashToken(token)), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())));
  return row ?? null;
}

/**
 * Accepting uses the token up and creates the person in one transaction; a second use, or a race of
 * two, finds no open invitation and creates nobody.
 */
export async function acceptInvitation(token: string, input: { name: string; password: string }): Promise<string | null> {
  const passwordHash = await hashPassword(input.password);
  try {
    return await getDb().transaction(async (tx) => {
      const [invitation] = await tx
        .update(invitations)
        .set({ acceptedAt: new Date() })
        .where(and(eq(invitations.tokenHash, hashToken(token)), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())))
        .returning({ shopId: invitations.shopId, email: invitations.email, role: invitations.role });
      if (!invitation) return null;
      const id = generateIdFromEntropySize(10);
      await tx.insert(users).values({ id, shopId: invitation.shopId, email: invitation.email, name: input.name, role: invitation.role as Role, passwordHash });
      return id;
    });
  } catch (error) {
    if (isUniqueViolation(error)) throw new EmailTakenError();
    throw error;
  }
}

/** A reset token for the account, or null when there is none (the caller answers the same either way). */
export async function createPasswordReset(email: string): Promise<{ token: string; name: string; email: string } | null> {
  const user = await findUserByEmail(email);
  if (!user) return null;
  const { token, hash } = newToken();
  await getDb().insert(passwordResets).values({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_LIFETIME_MS) });
  return { token, name: user.name, email: user.email };
}

export async function isOpenPasswordReset(token: string): Promise<boolean> {
  const [row] = await getDb()
    .select({ id: passwordResets.id })
    .from(passwordResets)
    .where(and(eq(passwordResets.tokenHash, hashToken(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, new Date())));
  return Boolean(row);
}

/** Uses the token up and sets the new password; returns the user id, or null for a spent or expired token. */
export async function resetPassword(token: string, password: string): Promise<string | null> {
  const passwordHash = await hashPassword(password);
  return getDb().transaction(async (tx) => {
    const [reset] = await tx
      .update(passwordResets)
      .set({ usedAt: new Date() })
      .where(and(eq(passwordResets.tokenHash, hashToken(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, new Date())))
      .returning({ userId: passwordResets.userId });
    if (!reset) return null;
    await tx.update(users).set({ passwordHash }).where(eq(users.id, reset.userId));
    return reset.userId;
  });
}
