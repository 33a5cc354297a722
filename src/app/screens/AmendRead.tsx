/** Amend a signed read (full screen lands in the next step). */
export function AmendRead({ readId }: { readId: string }) {
  return <p>Read {readId}</p>;
}
