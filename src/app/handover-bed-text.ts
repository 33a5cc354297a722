/** A bed as printed and named in files: 'Bed 3' stays 'Bed 3', a bare '12' becomes 'Bed 12', so nothing reads 'Bed: Bed 3'. */
export function bedText(label: string): string {
  return /^bed\b/i.test(label.trim()) ? label.trim() : `Bed ${label.trim()}`;
}
