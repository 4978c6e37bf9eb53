// The areas of Stopwise, in the order work flows through a shop (DESIGN.md, "The flow of data").
import { can, type Permission, type Role } from "~/lib/permissions";

export type Area = {
  path: string;
  permission: Permission;
  label: string;
  forWhom: string;
  summary: string;
};

export const AREAS: Area[] = [
  {
    path: "/orders",
    permission: "orders:read",
    label: "Orders",
    forWhom: "Owner",
    summary: "Who ordered what, for which event date, and when it must leave the shop.",
  },
  {
    path: "/calendar",
    permission: "orders:read",
    label: "Calendar",
    forWhom: "Owner",
    summary: "The month's due days and event days, order by order.",
  },
  {
    path: "/customers",
    permission: "customers:read",
    label: "Customers",
    forWhom: "Owner",
    summary: "The people and businesses the shop makes for.",
  },
  {
    path: "/catalogue",
    permission: "catalogue:read",
    label: "Catalogue",
    forWhom: "Owner",
    summary: "What the shop sells, each product as a bill of parts.",
  },
  {
    path: "/batches",
    permission: "batches:read",
    label: "Batches",
    forWhom: "Planner",
    summary: "What is due, grouped per material and thickness, laid out on panels.",
  },
  {
    path: "/rack",
    permission: "rack:read",
    label: "Offcut rack",
    forWhom: "Planner",
    summary: "Reusable offcuts by material, with their size and where they sit.",
  },
  {
    path: "/saw",
    permission: "floor:read",
    label: "Saw station",
    forWhom: "Sawyer",
    summary: "The released batches, set-up by set-up, for the tablet beside the saw.",
  },
  {
    path: "/sleds",
    permission: "sleds:read",
    label: "Sleds & saws",
    forWhom: "Sawyer",
    summary: "Measured blade kerf per saw, and squareness checks of each crosscut sled.",
  },
  {
    path: "/ledger",
    permission: "ledger:read",
    label: "Ledger",
    forWhom: "Bookkeeper",
    summary: "What each batch cost and what became scrap or a reusable offcut.",
  },
  {
    path: "/ledger/deposits",
    permission: "deposits:read",
    label: "Deposits",
    forWhom: "Bookkeeper",
    summary: "Deposits asked, paid and refunded per order and per month, and the balances due.",
  },
  {
    path: "/team",
    permission: "team:manage",
    label: "Team",
    forWhom: "Owner",
    summary: "The people of the shop and their roles.",
  },
  {
    path: "/settings",
    permission: "settings:read",
    label: "Shop settings",
    forWhom: "Owner",
    summary: "Units, currency, kerf, trim, laser bed and saw capacities.",
  },
];

export function areasFor(role: Role): Area[] {
  return AREAS.filter((area) => can(role, area.permission));
}

export function areaFor(path: string): Area {
  const area = AREAS.find((a) => a.path === path);
  if (!area) throw new Error(`No area at ${path}`);
  return area;
}
