/** Unit settings (full screen lands in the next step). */
export function UnitSettings() {
  return <p>Unit settings</p>;
}
