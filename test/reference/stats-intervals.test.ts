/**
 * Share intervals (app/engine/math/stats.ts) against sources outside the project:
 * - z = Φ⁻¹(0.975) recomputed here in 60-digit arithmetic with mathjs BigNumbers (Newton's method
 *   on Φ(z) = ½(1 + erf(z/√2)), erf from its Maclaurin series), and the 10-digit table value
 *   1.959963985 (M. Abramowitz & I. A. Stegun, Handbook of Mathematical Functions, 1964,
 *   Table 26.5, Q(x) = 0.025; from memory);
 * - the Wilson score interval: its defining score equation (E. B. Wilson, JASA 22:209, 1927),
 *   the textbook 0 of 100 → upper bound 0.0370, 5 of 50 worked by hand below, and the worked
 *   examples of R. G. Newcombe, "Two-sided confidence intervals for the single proportion:
 *   comparison of seven methods", Stat. Med. 17:857–872, 1998, Table II, method 3 (from memory);
 * - the rule of three: J. A. Hanley & A. Lippman-Hand, JAMA 249(13):1743–1745, 1983, against the
 *   exact one-sided bound 1 − 0.05^(1/n) (C. J. Clopper & E. S. Pearson, Biometrika 26:404, 1934,
 *   at zero events).
 */
import { describe, expect, it } from 'vitest';
import { all, create, type BigNumber } from 'mathjs';
import { Z95, shareInterval, shareReport, wilsonInterval } from '../../app/engine/math/stats';

describe('z = Φ⁻¹(0.975)', () => {
  it('is the double nearest to the root of Φ(z) = 0.975 found in 60-digit arithmetic', () => {
    const M = create(all!, { number: 'BigNumber', precision: 60 });
    type Big = BigNumber;
    const B = (x: number | string): Big => M.bignumber(x) as Big;
    const pi = M.pi as unknown as Big;
    const erf = (x: Big): Big => {
      // erf x = 2/√π Σ (−1)ⁿ x^(2n+1) / (n! (2n+1))
      let s = B(0);
      let t = x;
      for (let n = 0; ;) {
        const term = t.div(2 * n + 1);
        if (term.abs().lt('1e-70')) break;
        s = s.plus(term);
        n++;
        t = t.times(x).times(x).neg().div(n);
      }
      return s.times(2).div(pi.sqrt());
    };
    const Phi = (z: Big) =>
      erf(z.div(B(2).sqrt()))
        .plus(1)
        .div(2);
    const phi = (z: Big) => z.times(z).div(-2).exp().div(pi.times(2).sqrt());
    let z = B('1.96');
    for (let i = 0; i < 8; i++) z = z.minus(Phi(z).minus('0.975').div(phi(z)));
    expect(Phi(z).minus('0.975').abs().lt('1e-55')).toBe(true);
    expect(Z95).toBe(Number(z.toString()));
    // Abramowitz & Stegun Table 26.5 (from memory): 1.959963985 to 9 decimals.
    expect(Z95.toFixed(9)).toBe('1.959963985');
  });
});

describe('Wilson score interval', () => {
  it('its ends solve the score equation (k/n − p)² = z² p(1 − p)/n (Wilson 1927)', () => {
    for (const n of [1, 2, 7, 50, 263, 10_000, 1_000_003]) {
      for (const k of [0, 1, Math.floor(n / 3), n - 1, n]) {
        if (k < 0 || k > n) continue;
        const { low, high } = wilsonInterval(k, n);
        const ph = k / n;
        expect(low).toBeLessThanOrEqual(ph);
        expect(high).toBeGreaterThanOrEqual(ph);
        for (const p of [low, high]) {
          if ((p === 0 && k === 0) || (p === 1 && k === n)) continue; // the clamped trivial end
          // Residual f(p) = (k/n − p)² − z² p(1 − p)/n: |f| ≤ |f′(p)|·δp for a relative root error
          // δp/p ≤ 1e-10, plus the rounding of f's own two terms.
          const lhs = (ph - p) ** 2;
          const rhs = (Z95 * Z95 * p * (1 - p)) / n;
          const slope = Math.abs(-2 * (ph - p) - (Z95 * Z95 * (1 - 2 * p)) / n);
          expect(Math.abs(lhs - rhs)).toBeLessThanOrEqual(1e-10 * p * slope + 1e-15 * Math.max(lhs, rhs));
        }
      }
    }
  });

  it('0 of 100: upper bound 0.0370 (textbook value, as quoted in the issue; closed form z²/(n + z²))', () => {
    const w = wilsonInterval(0, 100);
    expect(w.low).toBe(0);
    expect(w.high.toFixed(4)).toBe('0.0370');
  });

  it('5 of 50, worked by hand', () => {
    // By hand (z = 1.959964, z² = 3.841459):
    //   n + z² = 53.841459; centre = (5 + 1.920729)/53.841459 = 6.920729/53.841459 = 0.128539
    //   k(n − k)/n + z²/4 = 4.5 + 0.960365 = 5.460365, √ = 2.336742
    //   half = 1.959964/53.841459 × 2.336742 = 0.036403 × 2.336742 = 0.085063
    //   → [0.128539 − 0.085063, 0.128539 + 0.085063] = [0.043476, 0.213602]
    const w = wilsonInterval(5, 50);
    expect(w.low).toBeCloseTo(0.043476, 6);
    expect(w.high).toBeCloseTo(0.213602, 6);
    expect(shareInterval(5, 50)).toEqual({ share: 0.1, low: w.low, high: w.high, method: 'wilson' });
  });

  it('Newcombe (1998) Table II examples, method 3 (from memory; 4 decimals)', () => {
    const cases: [number, number, number, number][] = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
    ];
    for (const [k, n, lo, hi] of cases) {
      const w = wilsonInterval(k, n);
      expect(Math.abs(w.low - lo)).toBeLessThanOrEqual(5e-5);
      expect(Math.abs(w.high - hi)).toBeLessThanOrEqual(5e-5);
    }
  });

  it('the complement mirrors: interval(n − k) = 1 − interval(k)', () => {
    for (const [k, n] of [
      [3, 17],
      [40, 41],
      [1, 2],
    ] as const) {
      const a = wilsonInterval(k, n),
        b = wilsonInterval(n - k, n);
      expect(b.low).toBeCloseTo(1 - a.high, 14);
      expect(b.high).toBeCloseTo(1 - a.low, 14);
    }
  });

  it('refuses impossible counts', () => {
    expect(() => wilsonInterval(3, 2)).toThrow(/0 ≤ k ≤ n/);
    expect(() => wilsonInterval(-1, 2)).toThrow(/0 ≤ k ≤ n/);
    expect(() => wilsonInterval(0.5, 2)).toThrow(/whole numbers/);
    expect(() => wilsonInterval(0, 0)).toThrow(/at least one trial/);
  });
});

describe('reported shares: rule of three at zero events', () => {
  it('0 events in n: upper bound 3/n (Hanley & Lippman-Hand 1983)', () => {
    for (const n of [30, 100, 1000, 123_457]) {
      expect(shareInterval(0, n)).toEqual({ share: 0, low: 0, high: 3 / n, method: 'rule-of-three' });
      // 3/n against the exact one-sided 95 % bound 1 − 0.05^(1/n) (Clopper & Pearson 1934 at k = 0):
      // never below it, and within 6 % of it from n = 30 on (the paper: "n > 30").
      const exact = 1 - 0.05 ** (1 / n);
      expect(3 / n).toBeGreaterThanOrEqual(exact);
      expect(3 / n / exact - 1).toBeLessThan(0.06);
    }
    // With p = 3/n the chance of seeing no event at all, (1 − 3/n)ⁿ, is below 5 %: the bound is conservative.
    for (const n of [3, 10, 30, 1e4]) expect((1 - 3 / n) ** n).toBeLessThan(0.05);
  });

  it('n events in n: the mirror image [1 − 3/n, 1]; n < 3 caps at the whole range; no cases: [0, 1]', () => {
    expect(shareInterval(200, 200)).toEqual({ share: 1, low: 1 - 3 / 200, high: 1, method: 'rule-of-three' });
    expect(shareInterval(0, 2)).toEqual({ share: 0, low: 0, high: 1, method: 'rule-of-three' });
    expect(shareInterval(1, 1)).toEqual({ share: 1, low: 0, high: 1, method: 'rule-of-three' });
    expect(shareInterval(0, 0)).toEqual({ share: 0, low: 0, high: 1, method: 'no-cases' });
  });

  it('every other share carries its Wilson interval', () => {
    const s = shareInterval(37, 1000);
    expect(s.method).toBe('wilson');
    expect(s.share).toBe(0.037);
    expect(s.low).toBeLessThan(0.037);
    expect(s.high).toBeGreaterThan(0.037);
  });
});

describe('shareReport: the Wilson interval always, the rule of three beside it at zero events', () => {
  it('0 of 100: Wilson [0, 0.0370] (textbook value quoted in the issue) and rule of three 3/100', () => {
    const s = shareReport(0, 100);
    expect(s.count).toBe(0);
    expect(s.of).toBe(100);
    expect(s.share).toBe(0);
    expect(s.low).toBe(0);
    // Closed form at k = 0 (Wilson 1927): z²/(n + z²) = 3.841459/103.841459 = 0.0369935 (by hand).
    expect(s.high.toFixed(4)).toBe('0.0370');
    expect(s.high).toBeCloseTo(0.0369935, 7);
    expect(s.ruleOfThreeHigh).toBe(0.03); // 3/n (Hanley & Lippman-Hand 1983)
  });

  it('follows the closed form for k > 0 (Newcombe 1998 Table II, method 3, from memory) and carries no rule-of-three bound', () => {
    const s = shareReport(81, 263);
    expect(Math.abs(s.low - 0.2553)).toBeLessThanOrEqual(5e-5);
    expect(Math.abs(s.high - 0.3662)).toBeLessThanOrEqual(5e-5);
    expect(s.share).toBe(81 / 263);
    expect(s.ruleOfThreeHigh).toBeNull();
    // n of n: the Wilson interval's lower end n/(n + z²) (closed form at k = n), 200/203.841459 = 0.981155 by hand.
    const all = shareReport(200, 200);
    expect(all.low).toBeCloseTo(0.981155, 6);
    expect(all.high).toBe(1);
  });

  it('the rule-of-three bound caps at 1 for n < 3; no cases give the uninformative [0, 1]', () => {
    expect(shareReport(0, 2).ruleOfThreeHigh).toBe(1);
    expect(shareReport(0, 0)).toEqual({ count: 0, of: 0, share: 0, low: 0, high: 1, ruleOfThreeHigh: null });
    expect(() => shareReport(5, 4)).toThrow(/0 ≤ k ≤ n/);
  });

  it('3 × 10⁶ cases with no event: the bound 10⁻⁶ the issue quotes (rule of three, 3/n)', () => {
    expect(shareReport(0, 3_000_000).ruleOfThreeHigh).toBeCloseTo(1e-6, 18);
    // and the exact one-sided bound 1 − 0.05^(1/n) (Clopper & Pearson 1934 at k = 0) lies just below it
    const exact = 1 - 0.05 ** (1 / 3_000_000);
    expect(exact).toBeLessThan(1e-6);
    expect(exact).toBeGreaterThan(0.99e-6);
  });
});
