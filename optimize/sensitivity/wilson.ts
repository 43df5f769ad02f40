/**
 * The Wilson score interval of a binomial proportion [wilson1927]: the p with |p̂ − p| ≤ z·√(p(1 − p)/n),
 * centre (p̂ + z²/2n)/(1 + z²/n), half-width z·√(p̂(1 − p̂)/n + z²/4n²)/(1 + z²/n). Used for yields.
 */
export interface ProportionInterval {
  estimate: number;
  low: number;
  high: number;
}

/** @param successes 0 … trials. @param z the normal quantile (default 1.959963985, 95 % two-sided). */
export function wilsonInterval(successes: number, trials: number, z = 1.959963985): ProportionInterval {
  if (!Number.isInteger(trials) || trials < 1)
    throw new RangeError(`wilsonInterval: trials must be ≥ 1, got ${trials}`);
  if (!Number.isInteger(successes) || successes < 0 || successes > trials) {
    throw new RangeError(`wilsonInterval: successes must be 0 to ${trials}, got ${successes}`);
  }
  const p = successes / trials;
  const z2n = (z * z) / trials;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z * Math.sqrt((p * (1 - p)) / trials + z2n / (4 * trials))) / (1 + z2n);
  return { estimate: p, low: Math.max(0, centre - half), high: Math.min(1, centre + half) };
}
