import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  allocate,
  chargeAmount,
  chargeRoundingDifference,
  chargeRule,
  divRound,
  formatMoney,
  fromChargeAmount,
  fromMinor,
  minorUnits,
  mulDiv,
  percentOf,
  roundToStep,
  taxIncluded,
  toMinor,
} from '../../shared/money';

/** Rows of a reference TSV (comment lines start with '#'); a missing file throws, so the test fails. */
function readTsv(name: string): Record<string, string>[] {
  const text = readFileSync(new URL(`../../../shared/reference/${name}`, import.meta.url), 'utf8');
  const rows = text.split('\n').filter((l) => l.trim() !== '' && !l.startsWith('#'));
  const header = rows[0].split('\t');
  return rows.slice(1).map((r) => {
    const cells = r.split('\t');
    return Object.fromEntries(header.map((h, i) => [h, (cells[i] ?? '').trim()]));
  });
}

describe('minorUnits', () => {
  // Source: ISO 4217 list one (ISO/SIX "Current currency & funds code list", data as of 2024-06-25), as
  // reproduced by npm currency-codes 2.2.0 data.js and cross-checked with dinero.js iso4217.ts
  // (header of ../shared/reference/iso4217_minor_units.tsv).
  const iso = readTsv('iso4217_minor_units.tsv');

  it('reads a non-empty reference table', () => {
    expect(iso.length).toBeGreaterThanOrEqual(16);
  });

  it.each(iso.map((r) => [r.code, Number(r.minor_units_iso4217)] as const))('%s has %i minor units (ISO 4217)', (code, digits) => {
    expect(minorUnits(code)).toBe(digits);
  });

  it('agrees with the dinero.js cross-check column on every row', () => {
    for (const r of iso) expect(minorUnits(r.code), r.code).toBe(Number(r.dinero_exponent));
  });

  it('follows ISO where Intl does not (HUF: ISO 2, Intl on Node 20 / CLDR 48 says 0 — column node_intl_max_fraction_digits)', () => {
    const huf = iso.find((r) => r.code === 'HUF')!;
    expect(Number(huf.node_intl_max_fraction_digits)).not.toBe(Number(huf.minor_units_iso4217));
    expect(minorUnits('HUF')).toBe(Number(huf.minor_units_iso4217));
  });

  it('throws a clear error for unknown codes', () => {
    expect(() => minorUnits('XYZ')).toThrow('Unknown currency code "XYZ"');
    expect(() => minorUnits('')).toThrow(/Unknown currency code/);
    expect(() => minorUnits('US')).toThrow(/Unknown currency code "US"/);
    expect(() => minorUnits('USDX')).toThrow(/Unknown currency code/);
  });

  it('accepts lower case', () => {
    expect(minorUnits('kwd')).toBe(3);
  });
});

describe('toMinor', () => {
  it.each([
    ['12', 'USD', 1200],
    ['12.5', 'USD', 1250],
    ['12.50', 'USD', 1250],
    ['-3.20', 'USD', -320],
    ['0.01', 'USD', 1],
    ['-0', 'USD', 0],
    ['0.00', 'EUR', 0],
    ['  7.05 ', 'EUR', 705],
    ['500', 'JPY', 500],
    ['1.234', 'KWD', 1234],
    ['5.1', 'KWD', 5100],
    ['1234.5', 'HUF', 123450],
    ['0.0001', 'CLF', 1],
    ['90071992547409.91', 'USD', 9007199254740991],
  ] as const)('%s %s → %i', (s, code, minor) => {
    expect(toMinor(s, code)).toBe(minor);
  });

  it('gives 0, never -0', () => {
    expect(Object.is(toMinor('-0.00', 'USD'), 0)).toBe(true);
  });

  it('rejects more decimals than the currency has', () => {
    expect(() => toMinor('12.345', 'USD')).toThrow('USD has 2 decimal places; "12.345" has 3');
    expect(() => toMinor('1.500', 'USD')).toThrow(/2 decimal places/);
    expect(() => toMinor('12.5', 'JPY')).toThrow('JPY has no minor units; write a whole number such as "12"');
    expect(() => toMinor('12.0', 'JPY')).toThrow(/no minor units/);
    expect(() => toMinor('1.2345', 'KWD')).toThrow(/3 decimal places/);
  });

  it('rejects thousands separators with a message that says so', () => {
    expect(() => toMinor('1,234.50', 'USD')).toThrow(/thousands separators/);
    expect(() => toMinor('1 234', 'EUR')).toThrow(/thousands separators/);
    expect(() => toMinor("1'234.50", 'CHF')).toThrow(/thousands separators/);
  });

  it('rejects a decimal comma', () => {
    expect(() => toMinor('12,50', 'EUR')).toThrow(/decimal comma/);
  });

  it.each(['', 'abc', '12.', '.5', '+5', '1e3', '12.5.0', '--1', '0x10', 'NaN', 'Infinity', '12 USD', '$12'])('rejects %j', (s) => {
    expect(() => toMinor(s, 'USD')).toThrow();
  });

  it('rejects amounts past the safe-integer range instead of losing digits', () => {
    expect(() => toMinor('90071992547409.92', 'USD')).toThrow(/too large/);
  });

  it('rejects an unknown currency', () => {
    expect(() => toMinor('1', 'XYZ')).toThrow('Unknown currency code "XYZ"');
  });
});

describe('fromMinor', () => {
  it.each([
    [1250, 'USD', '12.50'],
    [-5, 'USD', '-0.05'],
    [0, 'USD', '0.00'],
    [500, 'JPY', '500'],
    [-1234, 'KWD', '-1.234'],
    [7, 'KWD', '0.007'],
    [123450, 'HUF', '1234.50'],
  ] as const)('%i %s → %s', (minor, code, s) => {
    expect(fromMinor(minor, code)).toBe(s);
  });

  it('refuses fractions of a minor unit', () => {
    expect(() => fromMinor(12.5, 'USD')).toThrow(/whole number of minor units/);
  });

  it('round-trips with toMinor for any safe integer in USD, JPY, KWD and CLF', () => {
    fc.assert(
      fc.property(fc.constantFrom('USD', 'JPY', 'KWD', 'CLF'), fc.maxSafeInteger(), fc.boolean(), (code, n, neg) => {
        const minor = neg ? -n : n;
        expect(toMinor(fromMinor(minor, code), code)).toBe(minor === 0 ? 0 : minor);
      }),
    );
  });
});

describe('formatMoney', () => {
  it('shows exactly the ISO digits', () => {
    expect(formatMoney(1250, 'USD', 'en-US')).toBe('$12.50');
    expect(formatMoney(500, 'JPY', 'en-US')).toMatch(/^¥500$/);
    expect(formatMoney(1234505, 'KWD', 'en-US')).toContain('1,234.505');
  });

  it('keeps HUF fillér although Intl would hide them (ISO 4217: 2 digits)', () => {
    const intlDefault = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'HUF' }).format(1234.5);
    expect(intlDefault).not.toContain('1,234.50'); // shows the disagreement this function overrides
    expect(formatMoney(123450, 'HUF', 'en-US')).toContain('1,234.50');
  });

  it('follows the locale', () => {
    expect(formatMoney(123456, 'EUR', 'de-DE')).toMatch(/^1\.234,56\s€$/u);
  });

  it('does not lose minor units on amounts past 2^53 / 100', () => {
    expect(formatMoney(9007199254740991, 'USD', 'en-US')).toBe('$90,071,992,547,409.91');
  });

  it('formats negatives', () => {
    expect(formatMoney(-320, 'USD', 'en-US')).toBe('-$3.20');
  });
});

describe('integer helpers (rounding: half away from zero)', () => {
  it('divRound rounds halves away from zero', () => {
    expect(divRound(5n, 2n)).toBe(3n);
    expect(divRound(-5n, 2n)).toBe(-3n);
    expect(divRound(7n, 3n)).toBe(2n);
    expect(divRound(8n, 3n)).toBe(3n);
    expect(divRound(-8n, 3n)).toBe(-3n);
    expect(divRound(5n, -2n)).toBe(-3n);
    expect(() => divRound(1n, 0n)).toThrow(/zero/);
  });

  it('percentOf: 1 bp = 0.01 %, rounded once, half away from zero', () => {
    expect(percentOf(25250, 500)).toBe(1263); // 1262.5
    expect(percentOf(10001, 5000)).toBe(5001); // 5000.5
    expect(percentOf(10003, 5000)).toBe(5002); // 5001.5
    expect(percentOf(-25250, 500)).toBe(-1263);
    expect(percentOf(999, 3333)).toBe(333); // 332.9667
    expect(percentOf(0, 2500)).toBe(0);
    expect(() => percentOf(10.5, 100)).toThrow();
  });

  it('mulDiv is exact beyond float precision', () => {
    expect(mulDiv(9007199254740991, 3, 3)).toBe(9007199254740991);
    expect(() => mulDiv(9007199254740991, 2, 1)).toThrow(/too large/);
  });

  it('taxIncluded takes the tax out of a gross amount', () => {
    expect(taxIncluded(1200, 2000)).toBe(200);
    expect(taxIncluded(30000, 1000)).toBe(2727); // 2727.27
    expect(taxIncluded(100, 0)).toBe(0);
  });

  it('roundToStep', () => {
    expect(roundToStep(5124, 10)).toBe(5120);
    expect(roundToStep(5125, 10)).toBe(5130);
    expect(roundToStep(5, 10)).toBe(10);
    expect(roundToStep(4, 10)).toBe(0);
  });

  it('allocate: parts sum to the total, follow the weights, are deterministic', () => {
    expect(allocate(346, [15, 60, 30, 30])).toEqual([38, 154, 77, 77]);
    expect(allocate(10, [1, 1, 1])).toEqual([4, 3, 3]);
    expect(allocate(5, [0, 0])).toEqual([5, 0]);
    expect(allocate(0, [])).toEqual([]);
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1e9 }), fc.array(fc.integer({ min: 0, max: 1e6 }), { minLength: 1, maxLength: 12 }), (total, weights) => {
        const parts = allocate(total, weights);
        expect(parts.reduce((s, p) => s + p, 0)).toBe(total);
        const sum = weights.reduce((s, w) => s + w, 0);
        parts.forEach((p, i) => {
          expect(Number.isInteger(p) && p >= 0).toBe(true);
          if (sum > 0) expect(Math.abs(p - (total * weights[i]) / sum)).toBeLessThan(1 + 1e-6);
        });
      }),
    );
  });
});

describe('chargeAmount — the payment service amount rules', () => {
  // Source: Stripe "Supported currencies" docs (#zero-decimal, #three-decimal, #special-cases) and the
  // stripe-node API types, as transcribed in ../shared/reference/stripe_currency_decimals.tsv (see its header).
  const rows = readTsv('stripe_currency_decimals.tsv');

  it('reads a non-empty reference table', () => {
    expect(rows.length).toBeGreaterThanOrEqual(20);
  });

  it('the tsv ISO column agrees with minorUnits', () => {
    for (const r of rows) expect(minorUnits(r.code), r.code).toBe(Number(r.iso4217_minor_units));
  });

  it.each(rows.map((r) => [r.code, r] as const))('%s: one major unit is sent with the listed exponent', (code, r) => {
    const oneMajor = 10 ** minorUnits(code);
    expect(chargeAmount(oneMajor, code)).toBe(10 ** Number(r.stripe_amount_exponent));
    expect(chargeRule(code).exponent).toBe(Number(r.stripe_amount_exponent));
  });

  it.each(rows.map((r) => [r.code, r] as const))('%s: amounts meet the constraint in the tsv', (code, r) => {
    const c = r.constraint_on_amount;
    const step = c.startsWith('multiple of 100') ? 100 : c.startsWith('multiple of 10') ? 10 : 1;
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1e9 }), (minor) => {
        const api = chargeAmount(minor, code);
        expect(Number.isSafeInteger(api) && api >= 0).toBe(true);
        expect(api % step).toBe(0);
        // the charge is the amount itself, off at most half a step of the service's precision
        const back = fromChargeAmount(api, code);
        const quantum = Math.max(chargeRule(code).minorStep, 1);
        expect(Math.abs(back - minor)).toBeLessThanOrEqual(quantum / 2);
        expect(chargeRoundingDifference(minor, code)).toBe(back - minor);
      }),
      { numRuns: 50 },
    );
  });

  it.each(rows.filter((r) => /^\d+(\.\d+)?$/.test(r.example_major)).map((r) => [r.code, r.example_major, r.example_stripe_amount] as const))(
    '%s: the worked example %s → %s',
    (code, major, expected) => {
      const api = chargeAmount(toMinor(major, code), code);
      const allowed = expected.split(' or ').map(Number);
      expect(allowed).toContain(api);
    },
  );

  it('three-decimal currencies round to the nearest ten, half away from zero (5.124 KWD → 5120, 5.125 → 5130)', () => {
    expect(chargeAmount(5124, 'KWD')).toBe(5120);
    expect(chargeAmount(5125, 'KWD')).toBe(5130);
    expect(chargeAmount(5126, 'BHD')).toBe(5130);
  });

  it('MGA: ISO has 2 digits but the service takes whole ariary', () => {
    expect(chargeAmount(12345, 'MGA')).toBe(123);
    expect(chargeAmount(12350, 'MGA')).toBe(124);
    expect(fromChargeAmount(124, 'MGA')).toBe(12400);
  });

  it('ISK and UGX are sent ×100 with 00 at the end', () => {
    expect(chargeAmount(5, 'ISK')).toBe(500);
    expect(chargeAmount(5, 'UGX')).toBe(500);
    expect(fromChargeAmount(500, 'ISK')).toBe(5);
  });

  it('HUF charges take any two-decimal integer', () => {
    expect(chargeAmount(1045, 'HUF')).toBe(1045);
  });

  it('refuses negatives, fractions, and currencies with no known rule', () => {
    expect(() => chargeAmount(-1, 'USD')).toThrow(/negative/);
    expect(() => chargeAmount(1.5, 'USD')).toThrow(/whole number/);
    expect(() => chargeAmount(1000, 'IQD')).toThrow(/not known/);
    expect(() => chargeAmount(1000, 'XYZ')).toThrow('Unknown currency code "XYZ"');
  });
});
