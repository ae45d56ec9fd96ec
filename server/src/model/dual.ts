// Forward-mode automatic differentiation with dual numbers: a value, its exact gradient with
// respect to all states, inputs and disturbances (one seed per variable), and a magnitude:
// the size of the terms that were summed to get the value, so "is this residual zero?" can be
// answered with a tolerance scaled to the computation (running error analysis in the spirit
// of Wilkinson; Higham, Accuracy and Stability of Numerical Algorithms, §3.3).
// A constant carries no gradient (null), which keeps constant sub-expressions cheap and lets
// the evaluator tell whether a nonlinear operation touched a variable.

export class Dual {
  constructor(
    readonly value: number,
    /** ∂value/∂variable for every variable; null for a constant. */
    readonly gradient: Float64Array | null,
    /** Sum of the absolute sizes of the terms that produced the value (≥ |value|). */
    readonly magnitude: number,
  ) {}

  static constant(value: number): Dual {
    return new Dual(value, null, Math.abs(value));
  }

  /** The variable with the given index among `count`, at the given value (seed e_index). */
  static variable(value: number, index: number, count: number): Dual {
    const gradient = new Float64Array(count);
    gradient[index] = 1;
    return new Dual(value, gradient, Math.abs(value));
  }

  get isConstant(): boolean {
    return this.gradient === null;
  }
}

function combine(
  a: Float64Array | null,
  ca: number,
  b: Float64Array | null,
  cb: number,
): Float64Array | null {
  if (a === null && b === null) return null;
  const length = (a ?? b)!.length;
  const result = new Float64Array(length);
  if (a !== null && ca !== 0) for (let i = 0; i < length; i++) result[i] = ca * a[i]!;
  if (b !== null && cb !== 0) for (let i = 0; i < length; i++) result[i] = result[i]! + cb * b[i]!;
  return result;
}

export function add(a: Dual, b: Dual): Dual {
  return new Dual(a.value + b.value, combine(a.gradient, 1, b.gradient, 1), a.magnitude + b.magnitude);
}

export function sub(a: Dual, b: Dual): Dual {
  return new Dual(a.value - b.value, combine(a.gradient, 1, b.gradient, -1), a.magnitude + b.magnitude);
}

export function neg(a: Dual): Dual {
  return new Dual(-a.value, combine(a.gradient, -1, null, 0), a.magnitude);
}

export function mul(a: Dual, b: Dual): Dual {
  return new Dual(a.value * b.value, combine(a.gradient, b.value, b.gradient, a.value), a.magnitude * b.magnitude);
}

/** The caller rejects a zero divisor first. */
export function div(a: Dual, b: Dual): Dual {
  const value = a.value / b.value;
  // d(a/b) = da/b − a·db/b²
  const gradient = combine(a.gradient, 1 / b.value, b.gradient, -value / b.value);
  return new Dual(value, gradient, a.magnitude / Math.abs(b.value));
}

/**
 * Applies a scalar function with known value f(x) and slope f'(x) (chain rule). The
 * magnitude grows like the function's local gain applied to the argument's magnitude.
 */
export function apply(a: Dual, value: number, slope: number): Dual {
  const gradient = a.gradient === null ? null : combine(a.gradient, slope, null, 0);
  const magnitude = Math.max(Math.abs(value), Math.abs(slope) * a.magnitude);
  return new Dual(value, gradient, magnitude);
}

/** a^b for a variable or constant base and exponent. d(a^b) = b a^(b−1) da + a^b ln(a) db. */
export function pow(a: Dual, b: Dual): Dual {
  const value = Math.pow(a.value, b.value);
  const baseSlope = b.value === 0 ? 0 : b.value * Math.pow(a.value, b.value - 1);
  const exponentSlope = b.gradient === null ? 0 : value * Math.log(a.value);
  const gradient = combine(a.gradient, baseSlope, b.gradient, exponentSlope);
  const magnitude = Math.max(Math.abs(value), a.magnitude > 0 && b.gradient === null ? Math.pow(a.magnitude, b.value) : 0);
  return new Dual(value, gradient, Number.isFinite(magnitude) ? magnitude : Math.abs(value));
}

/** Elementary functions: value and derivative at x. */
export const elementary: Record<string, (x: number) => { value: number; slope: number }> = {
  sin: (x) => ({ value: Math.sin(x), slope: Math.cos(x) }),
  cos: (x) => ({ value: Math.cos(x), slope: -Math.sin(x) }),
  tan: (x) => {
    const t = Math.tan(x);
    return { value: t, slope: 1 + t * t };
  },
  exp: (x) => {
    const e = Math.exp(x);
    return { value: e, slope: e };
  },
  log: (x) => ({ value: Math.log(x), slope: 1 / x }),
  sqrt: (x) => {
    const r = Math.sqrt(x);
    return { value: r, slope: 1 / (2 * r) };
  },
  tanh: (x) => {
    const t = Math.tanh(x);
    return { value: t, slope: 1 - t * t };
  },
  abs: (x) => ({ value: Math.abs(x), slope: x > 0 ? 1 : x < 0 ? -1 : 0 }),
};
