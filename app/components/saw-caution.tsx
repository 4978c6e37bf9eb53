/** The cautions wherever the sawyer cuts (the saw station, the test cuts on the sleds page). */
export function SawCaution() {
  return (
    <div className="rounded-lg border border-warn/40 bg-warn-soft p-4 text-sm text-warn" role="note">
      Guard and riving knife on, push stick ready, stand out of the line of the blade. Crosscut against a stop block on the sled's fence, never against the rip fence. The saw maker's manual and your shop's rules come first.
    </div>
  );
}
