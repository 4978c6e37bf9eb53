// The areas of Stopwise, in the order work flows through a shop (DESIGN.md, "The flow of data").
import { can, type Permission, type Role } from "~/lib/permissions";

export type Area = {
  path: string;
  permission: Permission;
  label: string;
  forWhom: string;
  summary: string;
  comingSoon: string[];
};

export const AREAS: Area[] = [
  {
    path: "/orders",
    permission: "orders:read",
    label: "Orders",
    forWhom: "Owner",
    summary: "Who ordered what, for which event date, and when it must leave the shop.",
    comingSoon: [
      "Orders with their customer, event date and due date, moving from draft to delivered",
      "Personalisation texts per item, typed or uploaded as CSV, and artwork files",
      "Confirmation e-mails to customers, with deposits",
    ],
  },
  {
    path: "/customers",
    permission: "customers:read",
    label: "Customers",
    forWhom: "Owner",
    summary: "The people and businesses the shop makes for.",
    comingSoon: ["Names, e-mail addresses, phone numbers and notes", "Search, and each customer's orders"],
  },
  {
    path: "/catalogue",
    permission: "catalogue:read",
    label: "Catalogue",
    forWhom: "Owner",
    summary: "What the shop sells, each product as a bill of parts.",
    comingSoon: [
      "Products with their parts: finished size, material, quantity, grain, sawn or laser-cut",
      "Materials and the stock panels they come in",
    ],
  },
  {
    path: "/batches",
    permission: "batches:read",
    label: "Batches",
    forWhom: "Planner",
    summary: "What is due, grouped per material and thickness, laid out on panels.",
    comingSoon: [
      "Batches proposed from confirmed orders due by a date",
      "Plans from the packing engine, drawn to scale, compared side by side",
      "Release to the saw, reserving panels and offcuts",
    ],
  },
  {
    path: "/rack",
    permission: "rack:read",
    label: "Offcut rack",
    forWhom: "Planner",
    summary: "Reusable offcuts by material, with their size and where they sit.",
    comingSoon: ["Offcuts per material with size, rack location and the batch that made them", "Full-sheet stock counts"],
  },
  {
    path: "/saw",
    permission: "floor:read",
    label: "Saw station",
    forWhom: "Sawyer",
    summary: "The released batches, set-up by set-up, for the tablet beside the saw.",
    comingSoon: [
      "Set-up sheets as PDF: panels to pull, rip and stop settings, tally boxes, cautions",
      "Ticking set-ups, recording spoiled parts, racking offcuts",
      "Part labels",
    ],
  },
  {
    path: "/sleds",
    permission: "sleds:read",
    label: "Sleds & saws",
    forWhom: "Sawyer",
    summary: "Measured blade kerf per saw, and squareness checks of each crosscut sled.",
    comingSoon: ["Kerf measurements from test cuts", "Five-cut sled checks with the correction to make"],
  },
  {
    path: "/ledger",
    permission: "ledger:read",
    label: "Ledger",
    forWhom: "Bookkeeper",
    summary: "What each batch cost and what became scrap or a reusable offcut.",
    comingSoon: ["Material cost and waste per batch, order and month", "Cost allocated to orders by area", "CSV export"],
  },
  {
    path: "/team",
    permission: "team:manage",
    label: "Team",
    forWhom: "Owner",
    summary: "The people of the shop and their roles.",
    comingSoon: ["Invitations by e-mail", "Roles: owner, planner, sawyer, bookkeeper"],
  },
  {
    path: "/settings",
    permission: "settings:read",
    label: "Shop settings",
    forWhom: "Owner",
    summary: "Units, currency, kerf, trim, laser bed and saw capacities.",
    comingSoon: ["Display unit (millimetres or fractional inches) and currency", "Default kerf, edge trim, minimum offcut, saw and laser limits"],
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
