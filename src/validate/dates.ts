/** Calendar dates as the data files write them. */

/** True for a real calendar date written YYYY-MM-DD (30 February is refused). */
export function isRealDate(s: string): boolean {
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}
