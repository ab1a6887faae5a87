import type { NetworkParameter, TouchstoneNetwork } from './touchstone-network.ts';

/** An N×N complex matrix, row-major: entry (i, j) at i·N + j. */
export interface NetworkMatrix {
  readonly ports: number;
  readonly re: Float64Array;
  readonly im: Float64Array;
}

/**
 * The network's parameters at frequency k as S, Y or Z, for real reference impedances (every
 * definition of S agrees there). With R the diagonal of the references and G = √R:
 * Z = G·(I + S)·(I − S)⁻¹·G, Y = G⁻¹·(I − S)·(I + S)⁻¹·G⁻¹, S = (Z̃ − I)·(Z̃ + I)⁻¹ with Z̃ = G⁻¹·Z·G⁻¹,
 * Y = Z⁻¹. A string says why it cannot be done (a complex reference, a singular matrix: an ideal
 * short, open or series element has no Z or no Y).
 */
export function convertNetworkPoint(network: TouchstoneNetwork, k: number, target: NetworkParameter): NetworkMatrix | string {
  const n = network.ports;
  const size = n * n;
  const from: NetworkMatrix = {
    ports: n,
    re: network.re.slice(k * size, (k + 1) * size),
    im: network.im.slice(k * size, (k + 1) * size),
  };
  if (network.parameter === target) return from;
  const g = new Float64Array(n);
  if (network.parameter === 'S' || target === 'S') {
    for (let i = 0; i < n; i += 1) {
      const re = network.referenceRe[k * n + i]!;
      if (network.referenceIm[k * n + i] !== 0 || !(re > 0)) {
        return `port ${i + 1}'s reference impedance is not a positive real number; S-parameters are converted only for real references`;
      }
      g[i] = Math.sqrt(re);
    }
  }
  const identity = identityMatrix(n);
  if (network.parameter === 'S') {
    const plus = add(identity, from, 1);
    const minus = add(identity, from, -1);
    if (target === 'Z') {
      const inverse = invert(minus);
      return typeof inverse === 'string' ? `no Z-parameters: ${inverse}` : scaleBoth(multiply(plus, inverse), g, g);
    }
    const inverse = invert(plus);
    const reciprocal = g.map((value) => 1 / value);
    return typeof inverse === 'string' ? `no Y-parameters: ${inverse}` : scaleBoth(multiply(minus, inverse), reciprocal, reciprocal);
  }
  if (target === 'S') {
    // Normalise to Z̃ (from Z: G⁻¹ Z G⁻¹; from Y: Z̃ = (G Y G)⁻¹).
    let normal: NetworkMatrix | string;
    if (network.parameter === 'Z') {
      const reciprocal = g.map((value) => 1 / value);
      normal = scaleBoth(from, reciprocal, reciprocal);
    } else {
      normal = invert(scaleBoth(from, g, g));
    }
    if (typeof normal === 'string') return `no S-parameters: ${normal}`;
    const inverse = invert(add(normal, identity, 1));
    return typeof inverse === 'string' ? `no S-parameters: ${inverse}` : multiply(add(normal, identity, -1), inverse);
  }
  const inverse = invert(from);
  return typeof inverse === 'string' ? `no ${target}-parameters: ${inverse}` : inverse;
}

function identityMatrix(n: number): NetworkMatrix {
  const re = new Float64Array(n * n);
  for (let i = 0; i < n; i += 1) re[i * n + i] = 1;
  return { ports: n, re, im: new Float64Array(n * n) };
}

/** a + sign·b. */
function add(a: NetworkMatrix, b: NetworkMatrix, sign: 1 | -1): NetworkMatrix {
  return { ports: a.ports, re: a.re.map((v, at) => v + sign * b.re[at]!), im: a.im.map((v, at) => v + sign * b.im[at]!) };
}

function multiply(a: NetworkMatrix, b: NetworkMatrix): NetworkMatrix {
  const n = a.ports;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let i = 0; i < n; i += 1) {
    for (let j = 0; j < n; j += 1) {
      let sumRe = 0;
      let sumIm = 0;
      for (let m = 0; m < n; m += 1) {
        const ar = a.re[i * n + m]!;
        const ai = a.im[i * n + m]!;
        const br = b.re[m * n + j]!;
        const bi = b.im[m * n + j]!;
        sumRe += ar * br - ai * bi;
        sumIm += ar * bi + ai * br;
      }
      re[i * n + j] = sumRe;
      im[i * n + j] = sumIm;
    }
  }
  return { ports: n, re, im };
}

/** diag(left) · a · diag(right). */
function scaleBoth(a: NetworkMatrix, left: Float64Array, right: Float64Array): NetworkMatrix {
  const n = a.ports;
  const factor = (at: number): number => left[Math.floor(at / n)]! * right[at % n]!;
  return { ports: n, re: a.re.map((v, at) => v * factor(at)), im: a.im.map((v, at) => v * factor(at)) };
}

/** Gauss–Jordan with partial pivoting; a string when the matrix is singular to working precision. */
function invert(a: NetworkMatrix): NetworkMatrix | string {
  const n = a.ports;
  const re = Float64Array.from(a.re);
  const im = Float64Array.from(a.im);
  const out = identityMatrix(n);
  const ore = out.re;
  const oim = out.im;
  let largest = 0;
  for (let at = 0; at < n * n; at += 1) largest = Math.max(largest, Math.hypot(re[at]!, im[at]!));
  for (let column = 0; column < n; column += 1) {
    let pivot = column;
    let best = 0;
    for (let row = column; row < n; row += 1) {
      const size = Math.hypot(re[row * n + column]!, im[row * n + column]!);
      if (size > best) [best, pivot] = [size, row];
    }
    if (!(best > 1e-13 * largest) || !Number.isFinite(best)) return 'the matrix is singular';
    if (pivot !== column) {
      for (const array of [re, im, ore, oim]) {
        for (let j = 0; j < n; j += 1) {
          const held = array[column * n + j]!;
          array[column * n + j] = array[pivot * n + j]!;
          array[pivot * n + j] = held;
        }
      }
    }
    // Scale the pivot row by 1/pivot.
    const pr = re[column * n + column]!;
    const pi = im[column * n + column]!;
    const d = pr * pr + pi * pi;
    const ir = pr / d;
    const ii = -pi / d;
    for (const [r, i] of [
      [re, im],
      [ore, oim],
    ] as const) {
      for (let j = 0; j < n; j += 1) {
        const xr = r[column * n + j]!;
        const xi = i[column * n + j]!;
        r[column * n + j] = xr * ir - xi * ii;
        i[column * n + j] = xr * ii + xi * ir;
      }
    }
    for (let row = 0; row < n; row += 1) {
      if (row === column) continue;
      const fr = re[row * n + column]!;
      const fi = im[row * n + column]!;
      if (fr === 0 && fi === 0) continue;
      for (const [r, i] of [
        [re, im],
        [ore, oim],
      ] as const) {
        for (let j = 0; j < n; j += 1) {
          const xr = r[column * n + j]!;
          const xi = i[column * n + j]!;
          r[row * n + j] = r[row * n + j]! - (fr * xr - fi * xi);
          i[row * n + j] = i[row * n + j]! - (fr * xi + fi * xr);
        }
      }
    }
  }
  return out;
}
