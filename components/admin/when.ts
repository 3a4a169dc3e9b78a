/** A time as the admin pages show it: UTC to the second, sortable by eye. */
export function formatUtc(ms: number): string {
  return new Date(ms).toISOString().replace("T", " ").slice(0, 19);
}
