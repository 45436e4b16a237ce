/**
 * Platt scaling (Platt 1999, "Probabilistic outputs for support vector machines"): a logistic
 * regression of "the explanation was exactly right" on logit(raw confidence), fitted by
 * Newton's method, with a weight per observation so that sources of different size can count
 * alike.
 */
export interface RawOutcome {
  raw: number;
  right: boolean;
}

export const logit = (raw: number) => {
  const p = Math.min(1 - 1e-9, Math.max(1e-9, raw));
  return Math.log(p / (1 - p));
};

export function fitPlatt(
  outcomes: readonly RawOutcome[],
  weights: readonly number[] = outcomes.map(() => 1),
): { slope: number; intercept: number } {
  const xs = outcomes.map((o) => logit(o.raw));
  const ys = outcomes.map((o) => (o.right ? 1 : 0));
  let a = 1;
  let b = 0;
  for (let iter = 0; iter < 50; iter++) {
    let ga = 0;
    let gb = 0;
    let haa = 0;
    let hab = 0;
    let hbb = 0;
    xs.forEach((x, i) => {
      const w0 = weights[i] as number;
      const p = 1 / (1 + Math.exp(-(a * x + b)));
      const g = w0 * ((ys[i] as number) - p);
      const w = w0 * (p * (1 - p) + 1e-9);
      ga += g * x;
      gb += g;
      haa += w * x * x;
      hab += w * x;
      hbb += w;
    });
    const det = haa * hbb - hab * hab;
    if (Math.abs(det) < 1e-12) break;
    a += (hbb * ga - hab * gb) / det;
    b += (haa * gb - hab * ga) / det;
  }
  return { slope: a, intercept: b };
}
