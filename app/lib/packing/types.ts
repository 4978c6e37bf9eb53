// Public shapes of a packing job and its plan. Lengths are millimetres, areas mm².
// x runs along a panel's length, y along its width.

export type Grain = "length" | "none";
export type Stages = 0 | 2 | 3;
export type Objective = "sheets" | "setups";

export interface StockInput {
  id: string;
  length: number;
  width: number;
  /** null = unlimited */
  quantity: number | null;
  /** cost of one panel, in the shop's currency */
  cost: number;
  grain: Grain;
  /** false for a racked offcut whose edges are already clean: no edge trim, used before full sheets */
  trimmed: boolean;
}

export interface PartInput {
  id: string;
  length: number;
  width: number;
  quantity: number;
  /**
   * false: grain locked. On grained stock the part's length lies along the panel's length.
   * On grain "none" stock turning it changes nothing visible, so it may still be turned.
   */
  rotate: boolean;
}

export interface MinOffcut {
  /** shorter side of a leftover worth racking, mm */
  shortSide: number;
  /** area of a leftover worth racking, mm² */
  area: number;
}

export interface MachineLimits {
  /** widest rip the fence allows, mm (stages 2 and 3: strips and rips to width) */
  ripMax?: number;
  /** widest piece the crosscut sled takes, mm (stages 2 and 3: strips that are crosscut) */
  sledWidthMax?: number;
  /** stop-block range, mm: crosscut settings outside it are planned but flagged to be cut to a marked line */
  stopMin?: number;
  stopMax?: number;
}

export interface Job {
  kerf: number;
  /** removed from each edge of trimmed stock, including the trimming cut's own kerf */
  trim: number;
  stages: Stages;
  objective: Objective;
  timeLimitMs: number;
  seed: number;
  stock: StockInput[];
  parts: PartInput[];
  minOffcut?: MinOffcut;
  limits?: MachineLimits;
}

export interface Placement {
  partId: string;
  /** lower-left corner on the panel (panel edge = 0, so the trim margin is included) */
  x: number;
  y: number;
  /** placed extent along x (panel length) and y (panel width) */
  length: number;
  width: number;
  /** true when the part's length lies along the panel's width */
  rotated: boolean;
}

export type CutKind = "breakdown" | "rip" | "crosscut";

export interface Cut {
  /** 1 = first cuts of the panel, 2 = cuts of the pieces those produce, ... */
  stage: number;
  kind: CutKind;
  /** "y": the cut line is y = at (along the panel's length); "x": the line is x = at (across it) */
  axis: "x" | "y";
  /** coordinate where the saw kerf begins; the kerf occupies [at, at + kerf] */
  at: number;
  /** extent of the cut line along the other axis */
  from: number;
  to: number;
  /** fence or stop setting: size of the piece on the low side of the cut */
  setting: number;
  /** a rip to width or crosscut to length that frees a single part from waste */
  trim: boolean;
}

export interface Rect {
  x: number;
  y: number;
  length: number;
  width: number;
}

export interface SheetPlan {
  stockId: string;
  length: number;
  width: number;
  /** false for an offcut (no edge trim) */
  trimmed: boolean;
  placements: Placement[];
  /** in cutting order: by stage, then by piece, then by position */
  cuts: Cut[];
  /** leftovers at least minOffcut in size: worth racking */
  offcuts: Rect[];
  /** leftovers too small to rack (edge trim margins are not listed here but are counted in scrapArea) */
  scrap: Rect[];
}

export interface Unplaced {
  partId: string;
  quantity: number;
  reason: string;
}

export interface Setup {
  kind: CutKind;
  /** fence (rip, breakdown) or stop (crosscut) setting, mm */
  setting: number;
  /** number of cuts made at this setting */
  count: number;
  /** true when a crosscut setting lies outside the stop block's range: cut to a marked line instead */
  outsideStopRange?: boolean;
}

export interface Metrics {
  /** panels used, full sheets and offcuts */
  sheets: number;
  /** area of the panels used, whole panels including trim margins, mm² */
  stockArea: number;
  partsArea: number;
  /** partsArea / stockArea */
  yield: number;
  offcutArea: number;
  /** everything else: edge-trim margins and leftovers too small to rack. stockArea = partsArea + kerfLoss + offcutArea + scrapArea */
  scrapArea: number;
  /** material removed by the saw kerf inside the trimmed panels */
  kerfLoss: number;
  /** number of distinct fence/stop settings (length of setups) */
  setups: number;
  /** lower bound on the panels needed for the parts that were placed */
  lowerBound: number;
  elapsedMs: number;
}

export interface Plan {
  sheets: SheetPlan[];
  unplaced: Unplaced[];
  setups: Setup[];
  metrics: Metrics;
}

export interface PackOptions {
  /** clock for the time budget; tests pass their own */
  now?: () => number;
  /** told the panel count of the best plan found so far, each time it improves (for progress displays) */
  onProgress?: (progress: { bestSheets: number }) => void;
}
