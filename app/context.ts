import { createContext } from "react-router";
import type { Role } from "~/lib/permissions";

export type SignedInUser = { id: string; shopId: string; shopName: string; email: string; name: string; role: Role };

/** Set by the root middleware for every request: the signed-in person, or null. */
export const userContext = createContext<SignedInUser | null>(null);
