/**
 * ceil(a / b) for whole numbers a ≥ 0, b > 0 by integer division: floating point gets
 * ceil(30 × 0.1) wrong (0.1 × 30 is 3.0000000000000004, whose ceiling is 4).
 */
export function ceilDiv(a: number, b: number): number {
  const r = a % b;
  return (a - r) / b + (r > 0 ? 1 : 0);
}

// The one plural and list helper, shared with the server and the client.
export { listWords, plural } from '../text/plural.js';
