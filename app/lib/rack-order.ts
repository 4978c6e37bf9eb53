// The offcut rack's reading order, the same on every visit: oldest first; offcuts racked at one
// moment (a release makes several) biggest first; and of one size, by place in number order, so
// "slot 5" comes before "slot 10" as a person walks the rack.
const places = new Intl.Collator("en", { numeric: true, sensitivity: "base" });

export interface RackEntry {
  id: string;
  createdAt: Date;
  lengthUm: number;
  widthUm: number;
  location: string;
}

export function byRackOrder(a: RackEntry, b: RackEntry): number {
  return (
    a.createdAt.getTime() - b.createdAt.getTime() ||
    b.lengthUm - a.lengthUm ||
    b.widthUm - a.widthUm ||
    places.compare(a.location, b.location) ||
    (a.id < b.id ? -1 : a.id > b.id ? 1 : 0)
  );
}
