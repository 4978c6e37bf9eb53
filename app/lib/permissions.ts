// What each role may do: the one table every loader, action and API route asks (DESIGN.md, "The people").
export const ROLES = ["owner", "planner", "sawyer", "bookkeeper"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  owner: "owner",
  planner: "planner",
  sawyer: "sawyer",
  bookkeeper: "bookkeeper",
};

const ALL: readonly Role[] = ROLES;
const OWNER: readonly Role[] = ["owner"];

export const PERMISSIONS = {
  "dashboard:read": ALL,
  "account:manage": ALL,
  "orders:read": ["owner", "planner", "bookkeeper"],
  "orders:write": OWNER,
  "customers:read": ["owner", "planner", "bookkeeper"],
  "customers:write": OWNER,
  "catalogue:read": ["owner", "planner", "bookkeeper"],
  "catalogue:write": OWNER,
  "batches:read": ["owner", "planner", "sawyer", "bookkeeper"],
  "batches:write": ["owner", "planner"],
  "rack:read": ["owner", "planner", "sawyer", "bookkeeper"],
  "rack:write": ["owner", "planner", "sawyer"],
  "floor:read": ["owner", "planner", "sawyer"],
  "floor:write": ["owner", "sawyer"],
  "sleds:read": ["owner", "planner", "sawyer"],
  "sleds:write": ["owner", "sawyer"],
  "ledger:read": ["owner", "bookkeeper"],
  "deposits:read": ["owner", "bookkeeper"],
  "deposits:refund": OWNER,
  "team:manage": OWNER,
  "settings:read": ["owner", "planner"],
  "settings:write": OWNER,
  "outbox:read": OWNER,
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(role: Role, permission: Permission): boolean {
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

/** The roles that hold a permission, for "you need the … role" messages. */
export function rolesFor(permission: Permission): readonly Role[] {
  return PERMISSIONS[permission];
}

export function deniedMessage(permission: Permission): string {
  const roles = rolesFor(permission).map((r) => ROLE_LABELS[r]);
  const list = roles.length === 1 ? roles[0] : `${roles.slice(0, -1).join(", ")} or ${roles.at(-1)}`;
  return `You need the ${list} role for this.`;
}

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}
