/**
 * Angle unit conversions: 1° = π/180 rad. Written as (x·π)/180 and (x·180)/π,
 * in that operation order, so every call gives the same bits as the inline form.
 */
export const degToRad = (deg: number): number => (deg * Math.PI) / 180;
export const radToDeg = (rad: number): number => (rad * 180) / Math.PI;
