// The Stopwise schema. Lengths are integer micrometres (`*_um`), money is integer minor units
// (`*_minor`), so no floating-point value is ever stored or summed.
import { sql } from "drizzle-orm";
import {
  bigint,
  boolean,
  date,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import type { SheetSize } from "../app/lib/stock-names";

const createdAt = () => timestamp("created_at", { withTimezone: true, mode: "date" }).notNull().defaultNow();

export const roleEnum = pgEnum("role", ["owner", "planner", "sawyer", "bookkeeper"]);
export const unitEnum = pgEnum("display_unit", ["mm", "in"]);
export const materialKindEnum = pgEnum("material_kind", ["plywood", "mdf", "acrylic", "hardwood", "other"]);
export const grainEnum = pgEnum("grain", ["length", "none"]);
export const processEnum = pgEnum("part_process", ["saw", "laser"]);
export const orderStatusEnum = pgEnum("order_status", [
  "draft",
  "confirmed",
  "in_production",
  "ready",
  "delivered",
  "cancelled",
]);
// expected: a released plan will make it; racked: on the rack; reserved: a released batch will cut it.
export const offcutStatusEnum = pgEnum("offcut_status", ["expected", "racked", "reserved", "used", "discarded"]);
export const batchStatusEnum = pgEnum("batch_status", ["open", "planned", "released", "cut", "closed"]);
export const planStatusEnum = pgEnum("plan_status", ["queued", "running", "done", "failed", "cancelled"]);
export const depositRuleEnum = pgEnum("deposit_rule", ["none", "percent", "fixed"]);
// requested: the link is out; refund_pending: the payment service took the refund but has not settled it.
export const depositStatusEnum = pgEnum("deposit_status", ["requested", "paid", "refund_pending", "refunded"]);
export const depositMoveEnum = pgEnum("deposit_move", ["payment", "refund"]);

export const shops = pgTable("shops", {
  id: uuid("id").primaryKey().defaultRandom(),
  name: text("name").notNull(),
  displayUnit: unitEnum("display_unit").notNull().default("mm"),
  currency: text("currency").notNull().default("EUR"),
  // The shop's clock (an IANA zone): which day "today" is, and the times people read. The ledger's days and months stay UTC.
  timeZone: text("time_zone").notNull().default("UTC"),
  kerfUm: integer("kerf_um").notNull().default(3200),
  edgeTrimUm: integer("edge_trim_um").notNull().default(10000),
  minOffcutShortUm: integer("min_offcut_short_um").notNull().default(100000),
  minOffcutAreaMm2: integer("min_offcut_area_mm2").notNull().default(40000),
  laserBedLengthUm: integer("laser_bed_length_um").notNull().default(600000),
  laserBedWidthUm: integer("laser_bed_width_um").notNull().default(400000),
  laserSpacingUm: integer("laser_spacing_um").notNull().default(3000),
  ripMaxUm: integer("rip_max_um").notNull().default(760000),
  sledWidthMaxUm: integer("sled_width_max_um").notNull().default(610000),
  stopMinUm: integer("stop_min_um").notNull().default(20000),
  stopMaxUm: integer("stop_max_um").notNull().default(1200000),
  // Largest sled squareness error accepted, micrometres per metre of crosscut (0.15 mm/m: a common shop target).
  sledToleranceUmPerM: integer("sled_tolerance_um_per_m").notNull().default(150),
  // The deposit asked when an order is confirmed: a whole percentage of the order total, or a fixed amount.
  depositRule: depositRuleEnum("deposit_rule").notNull().default("none"),
  depositPercent: integer("deposit_percent"),
  depositFixedMinor: integer("deposit_fixed_minor"),
  createdAt: createdAt(),
});

// lucia needs a text primary key on users and sessions.
export const users = pgTable(
  "users",
  {
    id: text("id").primaryKey(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    name: text("name").notNull(),
    role: roleEnum("role").notNull(),
    passwordHash: text("password_hash").notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("users_email_key").on(sql`lower(${t.email})`), index("users_shop_idx").on(t.shopId)],
);

export const sessions = pgTable("sessions", {
  id: text("id").primaryKey(),
  userId: text("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  expiresAt: timestamp("expires_at", { withTimezone: true, mode: "date" }).notNull(),
  // Sign-in time: however active, a session ends 12 h after it (app/auth.server.ts).
  createdAt: createdAt(),
});

export const materials = pgTable(
  "materials",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    kind: materialKindEnum("kind").notNull(),
    thicknessUm: integer("thickness_um").notNull(),
    note: text("note").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [index("materials_shop_idx").on(t.shopId)],
);

export const stockPanels = pgTable(
  "stock_panels",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    materialId: uuid("material_id")
      .notNull()
      .references(() => materials.id, { onDelete: "cascade" }),
    lengthUm: integer("length_um").notNull(),
    widthUm: integer("width_um").notNull(),
    costMinor: integer("cost_minor").notNull(),
    onHand: integer("on_hand").notNull().default(0),
    grain: grainEnum("grain").notNull().default("length"),
  },
  (t) => [index("stock_panels_material_idx").on(t.materialId)],
);

export const offcuts = pgTable(
  "offcuts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    materialId: uuid("material_id")
      .notNull()
      .references(() => materials.id, { onDelete: "cascade" }),
    lengthUm: integer("length_um").notNull(),
    widthUm: integer("width_um").notNull(),
    grain: grainEnum("grain").notNull().default("length"),
    location: text("location").notNull().default(""),
    status: offcutStatusEnum("status").notNull().default("racked"),
    // The batch whose plan made it, and the released batch that will cut it.
    sourceBatchId: uuid("source_batch_id"),
    reservedBatchId: uuid("reserved_batch_id"),
    createdAt: createdAt(),
  },
  (t) => [index("offcuts_shop_material_idx").on(t.shopId, t.materialId)],
);

export const customers = pgTable(
  "customers",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    email: text("email").notNull().default(""),
    phone: text("phone").notNull().default(""),
    notes: text("notes").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [index("customers_shop_idx").on(t.shopId)],
);

export const products = pgTable(
  "products",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    priceMinor: integer("price_minor").notNull(),
    leadTimeDays: integer("lead_time_days"),
    // A retired product is no longer offered on new lines; the orders that have it keep it.
    retiredAt: timestamp("retired_at", { withTimezone: true, mode: "date" }),
    createdAt: createdAt(),
  },
  (t) => [index("products_shop_idx").on(t.shopId)],
);

export const productParts = pgTable(
  "product_parts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    productId: uuid("product_id")
      .notNull()
      .references(() => products.id, { onDelete: "cascade" }),
    materialId: uuid("material_id")
      .notNull()
      .references(() => materials.id),
    name: text("name").notNull(),
    lengthUm: integer("length_um").notNull(),
    widthUm: integer("width_um").notNull(),
    quantity: integer("quantity").notNull().default(1),
    grainLocked: boolean("grain_locked").notNull().default(false),
    process: processEnum("process").notNull().default("saw"),
    // Where the part stands in its product's bill, as the owner entered it (0 first).
    position: integer("position").notNull().default(0),
  },
  (t) => [index("product_parts_product_idx").on(t.productId)],
);

export const orders = pgTable(
  "orders",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    customerId: uuid("customer_id")
      .notNull()
      .references(() => customers.id),
    eventDate: date("event_date", { mode: "string" }).notNull(),
    dueDate: date("due_date", { mode: "string" }).notNull(),
    status: orderStatusEnum("status").notNull().default("draft"),
    notes: text("notes").notNull().default(""),
    confirmedAt: timestamp("confirmed_at", { withTimezone: true, mode: "date" }),
    // The confirmation e-mail: when it went out, or why the last try failed (retried without re-confirming).
    confirmationSentAt: timestamp("confirmation_sent_at", { withTimezone: true, mode: "date" }),
    confirmationError: text("confirmation_error"),
    // The last e-mail telling the customer the order is ready to collect.
    readyNoticeSentAt: timestamp("ready_notice_sent_at", { withTimezone: true, mode: "date" }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("orders_shop_number_key").on(t.shopId, t.number),
    index("orders_due_idx").on(t.shopId, t.dueDate),
    index("orders_status_idx").on(t.shopId, t.status),
    index("orders_customer_idx").on(t.customerId),
  ],
);

export const orderLines = pgTable(
  "order_lines",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    orderId: uuid("order_id")
      .notNull()
      .references(() => orders.id, { onDelete: "cascade" }),
    productId: uuid("product_id")
      .notNull()
      .references(() => products.id),
    quantity: integer("quantity").notNull(),
    unitPriceMinor: integer("unit_price_minor").notNull(),
    personalisation: jsonb("personalisation").$type<string[]>().notNull().default([]),
    notes: text("notes").notNull().default(""),
  },
  (t) => [index("order_lines_order_idx").on(t.orderId)],
);

// What happened to an order, oldest first: who did it (null: Stopwise itself, or a member since
// removed) and the particulars its wording needs, kept as they were at the time (names, e-mails).
export const orderEventKindEnum = pgEnum("order_event_kind", ["created", "header", "line_added", "line_removed", "texts", "status", "confirmation_sent", "confirmation_failed", "ready_notice"]);
export const orderEvents = pgTable(
  "order_events",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    orderId: uuid("order_id")
      .notNull()
      .references(() => orders.id, { onDelete: "cascade" }),
    kind: orderEventKindEnum("kind").notNull(),
    detail: jsonb("detail").$type<Record<string, unknown>>().notNull().default({}),
    actorId: text("actor_id").references(() => users.id, { onDelete: "set null" }),
    // the clock at the insert, not the transaction's start, so entries of one transaction keep their order
    at: timestamp("at", { withTimezone: true, mode: "date" }).notNull().default(sql`clock_timestamp()`),
  },
  (t) => [index("order_events_order_idx").on(t.orderId, t.at)],
);

// Single-use tokens (invitations, password resets): only the SHA-256 of the token is stored.
export const invitations = pgTable(
  "invitations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    role: roleEnum("role").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    invitedBy: text("invited_by").references(() => users.id, { onDelete: "set null" }),
    expiresAt: timestamp("expires_at", { withTimezone: true, mode: "date" }).notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true, mode: "date" }),
    createdAt: createdAt(),
  },
  (t) => [index("invitations_shop_idx").on(t.shopId)],
);

export const passwordResets = pgTable("password_resets", {
  id: uuid("id").primaryKey().defaultRandom(),
  userId: text("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  tokenHash: text("token_hash").notNull().unique(),
  expiresAt: timestamp("expires_at", { withTimezone: true, mode: "date" }).notNull(),
  usedAt: timestamp("used_at", { withTimezone: true, mode: "date" }),
  createdAt: createdAt(),
});

// The store of rate-limiter-flexible's RateLimiterDrizzle (sign-in attempts per account and per address).
export const rateLimits = pgTable("rate_limits", {
  key: text("key").primaryKey(),
  points: integer("points").notNull().default(0),
  expire: timestamp("expire", { withTimezone: true, mode: "date" }),
});

// Artwork attached to an order line; the bytes live in the storage folder under `storageKey`, never
// under the user's file name.
export const lineFiles = pgTable(
  "line_files",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    orderLineId: uuid("order_line_id")
      .notNull()
      .references(() => orderLines.id, { onDelete: "cascade" }),
    fileName: text("file_name").notNull(),
    contentType: text("content_type").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    storageKey: text("storage_key").notNull().unique(),
    createdAt: createdAt(),
  },
  (t) => [index("line_files_line_idx").on(t.orderLineId)],
);

export const batches = pgTable(
  "batches",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    materialId: uuid("material_id")
      .notNull()
      .references(() => materials.id),
    status: batchStatusEnum("status").notNull().default("open"),
    dueBy: date("due_by", { mode: "string" }).notNull(),
    chosenPlanId: uuid("chosen_plan_id"),
    releasedAt: timestamp("released_at", { withTimezone: true, mode: "date" }),
    cutAt: timestamp("cut_at", { withTimezone: true, mode: "date" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("batches_shop_number_key").on(t.shopId, t.number), index("batches_shop_status_idx").on(t.shopId, t.status)],
);

// Which batch cuts an order line's parts of one material (a line may have parts in several materials).
export const batchLines = pgTable(
  "batch_lines",
  {
    batchId: uuid("batch_id")
      .notNull()
      .references(() => batches.id, { onDelete: "cascade" }),
    orderLineId: uuid("order_line_id")
      .notNull()
      .references(() => orderLines.id, { onDelete: "cascade" }),
    materialId: uuid("material_id")
      .notNull()
      .references(() => materials.id),
  },
  (t) => [uniqueIndex("batch_lines_line_material_key").on(t.orderLineId, t.materialId), index("batch_lines_batch_idx").on(t.batchId)],
);

// Lines the planner holds back: not proposed for a batch until released from the hold.
export const heldLines = pgTable(
  "held_lines",
  {
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    orderLineId: uuid("order_line_id")
      .notNull()
      .references(() => orderLines.id, { onDelete: "cascade" }),
    materialId: uuid("material_id")
      .notNull()
      .references(() => materials.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("held_lines_line_material_key").on(t.orderLineId, t.materialId)],
);

export type PlanSettings = {
  /** the saw and sled the plan assumes (the kerf comes from the saw's latest measurement unless typed) */
  sawId?: string | null;
  sledId?: string | null;
  kerfMm: number;
  trimMm: number;
  stages: 0 | 2 | 3;
  objective: "sheets" | "setups";
  timeLimitMs: number;
  offcutIds: string[];
  seed: number;
};
// beatAt: the database clock at the runner's last tick, so any runner can tell a plan whose runner died.
export type PlanProgress = { elapsedMs: number; bestSheets: number | null; beatAt?: string };

export const plans = pgTable(
  "plans",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    batchId: uuid("batch_id")
      .notNull()
      .references(() => batches.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    status: planStatusEnum("status").notNull().default("queued"),
    settings: jsonb("settings").$type<PlanSettings>().notNull(),
    progress: jsonb("progress").$type<PlanProgress>(),
    // The engine's job and plan, as saved after the validator passed it.
    result: jsonb("result").$type<unknown>(),
    // Panels the plan opens (stock panels and racked offcuts together), and how many of them are offcuts.
    sheets: integer("sheets"),
    offcutsUsed: integer("offcuts_used"),
    // The stock panels among them by size, the largest first (offcuts are counted apart above).
    sheetSizes: jsonb("sheet_sizes").$type<SheetSize[]>(),
    yieldPermille: integer("yield_permille"),
    costMinor: integer("cost_minor"),
    // What the offcuts it leaves are worth at the material's rate, as the ledger credits them when racked.
    rackCreditMinor: integer("rack_credit_minor"),
    setups: integer("setups"),
    offcutAreaMm2: integer("offcut_area_mm2"),
    error: text("error"),
    jobId: text("job_id"),
    createdAt: createdAt(),
    startedAt: timestamp("started_at", { withTimezone: true, mode: "date" }),
    finishedAt: timestamp("finished_at", { withTimezone: true, mode: "date" }),
  },
  (t) => [uniqueIndex("plans_batch_number_key").on(t.batchId, t.number)],
);

export const saws = pgTable("saws", {
  id: uuid("id").primaryKey().defaultRandom(),
  shopId: uuid("shop_id")
    .notNull()
    .references(() => shops.id, { onDelete: "cascade" }),
  name: text("name").notNull(),
  blade: text("blade").notNull().default(""),
  createdAt: createdAt(),
});

// A test cut's measured kerf; plans use the latest one of their saw.
export const kerfMeasurements = pgTable(
  "kerf_measurements",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    sawId: uuid("saw_id")
      .notNull()
      .references(() => saws.id, { onDelete: "cascade" }),
    kerfUm: integer("kerf_um").notNull(),
    note: text("note").notNull().default(""),
    measuredBy: text("measured_by").references(() => users.id, { onDelete: "set null" }),
    measuredAt: timestamp("measured_at", { withTimezone: true, mode: "date" }).notNull().defaultNow(),
  },
  (t) => [index("kerf_measurements_saw_idx").on(t.sawId, t.measuredAt)],
);

export const sleds = pgTable("sleds", {
  id: uuid("id").primaryKey().defaultRandom(),
  shopId: uuid("shop_id")
    .notNull()
    .references(() => shops.id, { onDelete: "cascade" }),
  sawId: uuid("saw_id").references(() => saws.id, { onDelete: "set null" }),
  name: text("name").notNull(),
  stopMinUm: integer("stop_min_um").notNull(),
  stopMaxUm: integer("stop_max_um").notNull(),
  widestUm: integer("widest_um").notNull(),
  createdAt: createdAt(),
});

// A five-cut squareness check: the final strip's width at both ends, its length, and the distance
// from the fence's pivot to its adjustment point.
export const sledChecks = pgTable(
  "sled_checks",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    sledId: uuid("sled_id")
      .notNull()
      .references(() => sleds.id, { onDelete: "cascade" }),
    widthFirstEndUm: integer("width_first_end_um").notNull(),
    widthSecondEndUm: integer("width_second_end_um").notNull(),
    stripLengthUm: integer("strip_length_um").notNull(),
    pivotDistanceUm: integer("pivot_distance_um").notNull(),
    checkedBy: text("checked_by").references(() => users.id, { onDelete: "set null" }),
    checkedAt: timestamp("checked_at", { withTimezone: true, mode: "date" }).notNull().defaultNow(),
  },
  (t) => [index("sled_checks_sled_idx").on(t.sledId, t.checkedAt)],
);

// The floor's record of a released batch: each set-up of the chosen plan ticked with the count cut.
export const setupTicks = pgTable(
  "setup_ticks",
  {
    batchId: uuid("batch_id")
      .notNull()
      .references(() => batches.id, { onDelete: "cascade" }),
    setupIndex: integer("setup_index").notNull(),
    countCut: integer("count_cut").notNull(),
    tickedBy: text("ticked_by").references(() => users.id, { onDelete: "set null" }),
    tickedAt: timestamp("ticked_at", { withTimezone: true, mode: "date" }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("setup_ticks_batch_setup_key").on(t.batchId, t.setupIndex)],
);

export type RecutOrigin = { orderId: string; orderNumber: number; customerName: string; lineId: string; productName: string; partName: string; itemIndex: number; text: string | null };

// A spoiled part to cut again: it comes back as an open part of its material for the next batch.
export const recutParts = pgTable(
  "recut_parts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    materialId: uuid("material_id")
      .notNull()
      .references(() => materials.id),
    spoiledInBatchId: uuid("spoiled_in_batch_id")
      .notNull()
      .references(() => batches.id, { onDelete: "cascade" }),
    // The batch that cuts it again, once one takes it.
    batchId: uuid("batch_id").references(() => batches.id, { onDelete: "set null" }),
    partName: text("part_name").notNull(),
    lengthUm: integer("length_um").notNull(),
    widthUm: integer("width_um").notNull(),
    grainLocked: boolean("grain_locked").notNull(),
    process: processEnum("process").notNull(),
    reason: text("reason").notNull(),
    origin: jsonb("origin").$type<RecutOrigin | null>(),
    recordedBy: text("recorded_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("recut_parts_open_idx").on(t.shopId, t.materialId, t.batchId)],
);

export type OrderAllocation = { orderId: string; orderNumber: number; partsAreaMm2: number; costMinor: number };
export type PanelCost = { kind: "panel" | "offcut"; lengthUm: number; widthUm: number; costMinor: number; partsAreaMm2: number };

// The books of a batch, written in the same transaction that closes it as cut, so later price changes
// never rewrite what a batch cost. Areas are mm², money minor units.
export const batchCosts = pgTable(
  "batch_costs",
  {
    batchId: uuid("batch_id")
      .primaryKey()
      .references(() => batches.id, { onDelete: "cascade" }),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    materialId: uuid("material_id")
      .notNull()
      .references(() => materials.id),
    cutAt: timestamp("cut_at", { withTimezone: true, mode: "date" }).notNull(),
    stockAreaMm2: bigint("stock_area_mm2", { mode: "number" }).notNull(),
    offcutDrawnAreaMm2: bigint("offcut_drawn_area_mm2", { mode: "number" }).notNull(),
    partsAreaMm2: bigint("parts_area_mm2", { mode: "number" }).notNull(),
    kerfLossMm2: bigint("kerf_loss_mm2", { mode: "number" }).notNull(),
    rackedAreaMm2: bigint("racked_area_mm2", { mode: "number" }).notNull(),
    scrapAreaMm2: bigint("scrap_area_mm2", { mode: "number" }).notNull(),
    spoiledAreaMm2: bigint("spoiled_area_mm2", { mode: "number" }).notNull(),
    spoiledCount: integer("spoiled_count").notNull(),
    costDrawnMinor: bigint("cost_drawn_minor", { mode: "number" }).notNull(),
    valueReturnedMinor: bigint("value_returned_minor", { mode: "number" }).notNull(),
    scrapCostMinor: bigint("scrap_cost_minor", { mode: "number" }).notNull(),
    spoiledCostMinor: bigint("spoiled_cost_minor", { mode: "number" }).notNull(),
    panels: jsonb("panels").$type<PanelCost[]>().notNull(),
    allocations: jsonb("allocations").$type<OrderAllocation[]>().notNull(),
  },
  (t) => [index("batch_costs_shop_cut_idx").on(t.shopId, t.cutAt)],
);

// A deposit asked of an order's customer. The e-mailed link carries `linkToken`; following it opens a
// Checkout Session at the payment service (a fresh one when the last has expired).
export const deposits = pgTable(
  "deposits",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    orderId: uuid("order_id")
      .notNull()
      .references(() => orders.id, { onDelete: "cascade" }),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    status: depositStatusEnum("status").notNull().default("requested"),
    linkToken: text("link_token").notNull().unique(),
    checkoutSessionId: text("checkout_session_id").unique(),
    paymentIntentId: text("payment_intent_id"),
    requestedAt: timestamp("requested_at", { withTimezone: true, mode: "date" }).notNull().defaultNow(),
    paidAt: timestamp("paid_at", { withTimezone: true, mode: "date" }),
    refundedAt: timestamp("refunded_at", { withTimezone: true, mode: "date" }),
  },
  (t) => [index("deposits_shop_order_idx").on(t.shopId, t.orderId), index("deposits_payment_intent_idx").on(t.paymentIntentId)],
);

// Money that moved for a deposit, exactly as the payment service reported it (minor units, always
// positive; `kind` says which way). The same webhook event never records twice (event_id), nor the
// same payment or refund under another event (kind + provider_ref).
export const depositMoves = pgTable(
  "deposit_moves",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    shopId: uuid("shop_id")
      .notNull()
      .references(() => shops.id, { onDelete: "cascade" }),
    depositId: uuid("deposit_id")
      .notNull()
      .references(() => deposits.id, { onDelete: "cascade" }),
    kind: depositMoveEnum("kind").notNull(),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    // The webhook event that reported it; null for a refund recorded from the API's own answer.
    eventId: text("event_id").unique(),
    // The payment intent (payments) or refund (refunds) at the payment service.
    providerRef: text("provider_ref").notNull(),
    occurredAt: timestamp("occurred_at", { withTimezone: true, mode: "date" }).notNull(),
    recordedBy: text("recorded_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("deposit_moves_kind_ref_key").on(t.kind, t.providerRef), index("deposit_moves_shop_time_idx").on(t.shopId, t.occurredAt), index("deposit_moves_deposit_idx").on(t.depositId)],
);
