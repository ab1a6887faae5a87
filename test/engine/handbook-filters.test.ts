import { describe, expect, it } from 'vitest';
import {
  commonModeRealisation,
  designOf,
  differentialRealisation,
  type LadderBranch,
  resistiveLossDb,
  respond,
  seriesL,
  shuntC,
} from '../support/ladder.ts';

/*
 * Low-pass prototype ladders from the handbook g-values, denormalised to 50 Ω and fc = 1 MHz,
 * realised in the two-line engine and compared with the textbook insertion-loss formulas.
 *
 * Sources (references.md §4):
 * - G. L. Matthaei, L. Young, E. M. T. Jones, "Microwave Filters, Impedance-Matching Networks, and
 *   Coupling Structures", McGraw-Hill 1964, Ch. 4 (prototype formulas and tables; section
 *   number from memory).
 * - D. M. Pozar, "Microwave Engineering", 4th ed., Wiley 2012, Ch. 8, insertion-loss method:
 *   maximally flat and equal-ripple prototype tables (table numbers from memory).
 * - The g-value formulas themselves: as printed in open-source filter-synthesis documentation
 *   (references.md tag V2); the table values below are references.md §4 (V2, C).
 * - Insertion loss: Butterworth 10·log(1 + (f/fc)^2n), Chebyshev 10·log(1 + ε²·T_n²(f/fc)),
 *   ε² = 10^(Lr/10) − 1 (textbook; the Chebyshev form is "from memory" in references.md and is
 *   confirmed there by ladder analysis, C).
 * - Denormalisation L = g·R0/ωc, C = g/(R0·ωc) (references.md §4, V2 / C).
 */

const R0 = 50;
const FC = 1e6;
const OMEGA_C = 2 * Math.PI * FC;

/** Butterworth g_k = 2·sin((2k − 1)π/(2n)), k = 1…n (g0 = g_{n+1} = 1). */
function butterworthG(n: number): number[] {
  return Array.from({ length: n }, (_, i) => 2 * Math.sin(((2 * (i + 1) - 1) * Math.PI) / (2 * n)));
}

/**
 * Chebyshev g-values for ripple lr dB: β = ln(coth(Lr/17.37)), γ = sinh(β/(2n)),
 * a_k = sin((2k−1)π/(2n)), b_k = γ² + sin²(kπ/n), g1 = 2a1/γ, g_k = 4a_{k−1}a_k/(b_{k−1}g_{k−1});
 * g_{n+1} = 1 for odd n, coth²(β/4) for even n. `constant` is 17.37 as printed or 40/ln 10 exactly.
 */
function chebyshevG(n: number, lr: number, constant = 40 / Math.LN10): { g: number[]; load: number } {
  const beta = Math.log(1 / Math.tanh(lr / constant));
  const gamma = Math.sinh(beta / (2 * n));
  const a = (k: number): number => Math.sin(((2 * k - 1) * Math.PI) / (2 * n));
  const b = (k: number): number => gamma * gamma + Math.sin((k * Math.PI) / n) ** 2;
  const g: number[] = [(2 * a(1)) / gamma];
  for (let k = 2; k <= n; k += 1) g.push((4 * a(k - 1) * a(k)) / (b(k - 1) * g[k - 2]!));
  const load = n % 2 === 1 ? 1 : 1 / Math.tanh(beta / 4) ** 2;
  return { g, load };
}

/** Chebyshev polynomial of the first kind, for |x| ≤ 1 and x > 1. */
function chebyshevT(n: number, x: number): number {
  return Math.abs(x) <= 1 ? Math.cos(n * Math.acos(x)) : Math.cosh(n * Math.acosh(x));
}

const butterworthLossDb = (n: number, f: number): number => 10 * Math.log10(1 + (f / FC) ** (2 * n));
const chebyshevLossDb = (n: number, lr: number, f: number): number =>
  10 * Math.log10(1 + (10 ** (lr / 10) - 1) * chebyshevT(n, f / FC) ** 2);

/** π form: shunt C first (odd k shunt, even k series); T form: series L first. */
function denormalise(g: readonly number[], form: 'pi' | 'tee'): LadderBranch[] {
  return g.map((gk, i) => {
    const shunt = form === 'pi' ? i % 2 === 0 : i % 2 === 1;
    return shunt ? shuntC(gk / (R0 * OMEGA_C)) : seriesL((gk * R0) / OMEGA_C);
  });
}

/** Half a unit in the 4th decimal, as the tables print them, plus rounding. */
const TABLE_TOLERANCE = 5e-5 + 1e-12;

describe('prototype g-values: published formulas reproduce the printed tables to 4 decimals (Matthaei et al. 1964 Ch. 4; Pozar 4th ed. Ch. 8; references.md §4)', () => {
  const butterworthTables: Record<number, number[]> = {
    1: [2.0],
    2: [1.4142, 1.4142],
    3: [1.0, 2.0, 1.0],
    4: [0.7654, 1.8478, 1.8478, 0.7654],
    5: [0.618, 1.618, 2.0, 1.618, 0.618],
    7: [0.445, 1.247, 1.8019, 2.0, 1.8019, 1.247, 0.445],
  };
  for (const [order, printed] of Object.entries(butterworthTables)) {
    it(`Butterworth n = ${order}: g_k = 2 sin((2k−1)π/2n) matches ${printed.join(', ')}`, () => {
      const g = butterworthG(Number(order));
      expect(g).toHaveLength(printed.length);
      g.forEach((value, k) => expect(Math.abs(value - printed[k]!), `g${k + 1}`).toBeLessThanOrEqual(TABLE_TOLERANCE));
    });
  }

  const chebyshevTables: { ripple: number; n: number; g: number[]; load: number }[] = [
    { ripple: 0.1, n: 3, g: [1.0316, 1.1474, 1.0316], load: 1 },
    { ripple: 0.5, n: 2, g: [1.4029, 0.7071], load: 1.9841 },
    { ripple: 0.5, n: 3, g: [1.5963, 1.0967, 1.5963], load: 1 },
    { ripple: 0.5, n: 4, g: [1.6703, 1.1926, 2.3661, 0.8419], load: 1.9841 },
    { ripple: 0.5, n: 5, g: [1.7058, 1.2296, 2.5408, 1.2296, 1.7058], load: 1 },
  ];
  for (const table of chebyshevTables) {
    /*
     * With 40/ln 10 the formula reproduces every printed digit. With the rounded 17.37 of the
     * documentation it can miss the 4th decimal by one unit (n = 4: g1 by 5.7e-5; n = 5: g3 by
     * 8.1e-5), so references.md's "agree to 4 decimals either way" holds only to ±1 in the 4th
     * decimal; that looser bound is what is asserted for 17.37.
     */
    for (const [name, constant, tolerance] of [
      ['17.37 as printed', 17.37, 1e-4],
      ['40/ln 10 exactly', 40 / Math.LN10, TABLE_TOLERANCE],
    ] as const) {
      it(`Chebyshev ${table.ripple} dB, n = ${table.n} (constant ${name}): ${table.g.join(', ')}, g${table.n + 1} = ${table.load}`, () => {
        const { g, load } = chebyshevG(table.n, table.ripple, constant);
        expect(g).toHaveLength(table.n);
        g.forEach((value, k) => expect(Math.abs(value - table.g[k]!), `g${k + 1}`).toBeLessThanOrEqual(tolerance));
        expect(Math.abs(load - table.load)).toBeLessThanOrEqual(tolerance);
      });
    }
  }

  it('denormalised 3rd-order 50 Ω, 1 MHz parts match the worked example (references.md §4, C)', () => {
    const relative = (a: number, b: number): number => Math.abs(a / b - 1);
    const [c1, l2] = denormalise(butterworthG(3), 'pi');
    expect(relative(c1!.value, 3.1831e-9)).toBeLessThan(2e-6);
    expect(relative(l2!.value, 15.9155e-6)).toBeLessThan(4e-6);
    const [l1, c2] = denormalise(butterworthG(3), 'tee');
    expect(relative(l1!.value, 7.95775e-6)).toBeLessThan(1e-6);
    expect(relative(c2!.value, 6.3662e-9)).toBeLessThan(1e-6);
    const [cc1, cl2] = denormalise(chebyshevG(3, 0.5).g, 'pi');
    expect(relative(cc1!.value, 5.08112e-9)).toBeLessThan(1e-6);
    expect(relative(cl2!.value, 8.7272e-6)).toBeLessThan(1e-6);
  });
});

/** The engine's computation is exact to rounding, so the formulas must hold far inside 0.01 dB. */
const FORMULA_TOLERANCE_DB = 1e-6;

interface Filter {
  readonly name: string;
  readonly ladder: LadderBranch[];
  readonly formulaDb: (f: number) => number;
}

const FILTERS: Filter[] = [
  { name: 'Butterworth n = 3, π form', ladder: denormalise(butterworthG(3), 'pi'), formulaDb: (f) => butterworthLossDb(3, f) },
  { name: 'Butterworth n = 3, T form', ladder: denormalise(butterworthG(3), 'tee'), formulaDb: (f) => butterworthLossDb(3, f) },
  { name: 'Butterworth n = 5, π form', ladder: denormalise(butterworthG(5), 'pi'), formulaDb: (f) => butterworthLossDb(5, f) },
  { name: 'Butterworth n = 5, T form', ladder: denormalise(butterworthG(5), 'tee'), formulaDb: (f) => butterworthLossDb(5, f) },
  { name: 'Chebyshev 0.5 dB n = 3, π form', ladder: denormalise(chebyshevG(3, 0.5).g, 'pi'), formulaDb: (f) => chebyshevLossDb(3, 0.5, f) },
  { name: 'Chebyshev 0.5 dB n = 3, T form', ladder: denormalise(chebyshevG(3, 0.5).g, 'tee'), formulaDb: (f) => chebyshevLossDb(3, 0.5, f) },
];

const REALISATIONS = [
  { mode: 'dm', label: 'differential mode (balanced: L/2 per line, C line to line)', realise: differentialRealisation },
  { mode: 'cm', label: 'common mode (lines joined: 2L per line, C/2 per line to ground)', realise: commonModeRealisation },
] as const;

describe('handbook ladders in the engine: 50 Ω/50 Ω insertion loss equals the textbook formula (Butterworth 10·log(1+(f/fc)^2n), Chebyshev 10·log(1+ε²T_n²)); Matthaei et al. / Pozar', () => {
  const frequencies = [0.15e6, 0.5e6, FC, 2 * FC, 10 * FC];
  for (const filter of FILTERS) {
    for (const realisation of REALISATIONS) {
      it(`${filter.name}, ${realisation.label}: at 0.15, 0.5, 1, 2 and 10 MHz`, () => {
        const response = respond(designOf(realisation.realise(filter.ladder)), frequencies);
        frequencies.forEach((f, i) => {
          const got = resistiveLossDb(response, realisation.mode, '50/50', i);
          expect(Math.abs(got - filter.formulaDb(f)), `${f} Hz: engine ${got} dB, formula ${filter.formulaDb(f)} dB`).toBeLessThanOrEqual(
            FORMULA_TOLERANCE_DB,
          );
        });
      });
    }
  }
});

describe('worked numbers of references.md §4 (C, ladder-verified), to their printed 6 decimals', () => {
  const PRINTED_TOLERANCE_DB = 1e-6;
  const cases = [
    {
      name: 'Butterworth n = 3, 50 Ω, fc = 1 MHz',
      forms: ['pi', 'tee'] as const,
      g: butterworthG(3),
      printed: [
        [150e3, 0.000049],
        [500e3, 0.067334],
        [1e6, 3.0103],
        [2e6, 18.129134],
        [10e6, 60.000004],
      ],
    },
    {
      name: 'Chebyshev 0.5 dB n = 3, 50 Ω, fc = 1 MHz',
      forms: ['pi'] as const,
      g: chebyshevG(3, 0.5).g,
      printed: [
        [500e3, 0.5],
        [1e6, 0.5],
        [2e6, 19.216057],
        [10e6, 62.840068],
      ],
    },
  ];
  for (const c of cases) {
    for (const form of c.forms) {
      for (const realisation of REALISATIONS) {
        it(`${c.name}, ${form === 'pi' ? 'π' : 'T'} form, ${realisation.mode.toUpperCase()}: ${c.printed.map(([f, v]) => `${v} dB @ ${f! / 1e6} MHz`).join(', ')}`, () => {
          const response = respond(designOf(realisation.realise(denormalise(c.g, form))), c.printed.map(([f]) => f!));
          c.printed.forEach(([f, printed], i) => {
            const got = resistiveLossDb(response, realisation.mode, '50/50', i);
            expect(Math.abs(got - printed!), `${f} Hz: engine ${got} dB, printed ${printed} dB`).toBeLessThanOrEqual(PRINTED_TOLERANCE_DB);
          });
        });
      }
    }
  }
});

describe('shape of the responses (textbook properties of the prototypes)', () => {
  const dense = Array.from({ length: 401 }, (_, k) => 1e4 * 10 ** (k / 100)); // 10 kHz … 100 MHz
  it('Butterworth n = 5 (DM): maximally flat — insertion loss rises monotonically and is 3.0103 dB at fc', () => {
    const response = respond(designOf(differentialRealisation(denormalise(butterworthG(5), 'pi'))), dense);
    for (let i = 1; i < dense.length; i += 1) {
      expect(resistiveLossDb(response, 'dm', '50/50', i)).toBeGreaterThanOrEqual(resistiveLossDb(response, 'dm', '50/50', i - 1) - 1e-9);
    }
    const atFc = respond(designOf(differentialRealisation(denormalise(butterworthG(5), 'pi'))), [FC]);
    expect(resistiveLossDb(atFc, 'dm', '50/50', 0)).toBeCloseTo(10 * Math.log10(2), 9);
  });

  it('Chebyshev 0.5 dB n = 3 (CM): equal ripple — never above 0.5 dB in the pass band, 0 dB where T3 = 0 (f = fc·√3/2)', () => {
    const passBand = dense.filter((f) => f <= FC);
    const design = designOf(commonModeRealisation(denormalise(chebyshevG(3, 0.5).g, 'pi')));
    const response = respond(design, passBand);
    passBand.forEach((f, i) => expect(resistiveLossDb(response, 'cm', '50/50', i), `${f} Hz`).toBeLessThanOrEqual(0.5 + 1e-9));
    // T3(x) = 0 at x = cos(π/6) = √3/2: full transmission there (closed form).
    const zero = respond(design, [(FC * Math.sqrt(3)) / 2]);
    expect(Math.abs(resistiveLossDb(zero, 'cm', '50/50', 0))).toBeLessThan(1e-9);
  });
});
