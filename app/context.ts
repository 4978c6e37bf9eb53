import { createContext } from "react-router";
import type { Role } from "~/lib/permissions";

export type SignedInUser = { id: string; shopId: string; shopName: string; email: string; name: string; role: Role };

/** Set by the root middleware for every request: the signed-in person, or null. */
export const userContext = createContext<SignedInUser | null>(null);

/**
 * Set by handleError (app/entry.server.tsx) when a loader or action failed because the database went
 * away mid-request; the root middleware then answers 503 instead of the 500 React Router would.
 */
export const databaseFaultContext = createContext<boolean>(false);
