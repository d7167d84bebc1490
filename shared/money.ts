// Money is an integer count of the currency's minor units (cents, fils, yen), never a float.
// Pure code: imported by the browser and the server alike, so nothing here may depend on I/O.
//
// ROUNDING RULE (one rule for the whole project's money maths): round half away from zero
// ("commercial rounding": 2.5 → 3, -2.5 → -3, 2.4999 → 2). Every helper below that divides
// (mulDiv, percentOf, the payment service's three-decimal step) uses it, and does the division in
// BigInt so the result is exact whatever the size of the operands.
import { code as currencyRecord } from 'currency-codes';

export type CurrencyCode = string;

function normaliseCode(code: string): string {
  if (typeof code !== 'string' || !/^[A-Za-z]{3}$/.test(code.trim())) {
    throw new Error(`Unknown currency code "${String(code)}"`);
  }
  return code.trim().toUpperCase();
}

/**
 * Digits after the decimal point in ISO 4217 (list one, via the currency-codes package): USD 2, JPY 0,
 * KWD 3, CLF 4. ISO wins over `Intl`: CLDR tells `Intl` to show HUF with 0 digits, ISO gives it 2.
 * Codes ISO lists with "N.A." minor units (XAU, XXX, XTS, ...) come through currency-codes as 0.
 * Throws `Unknown currency code "XYZ"` for a code ISO does not list.
 */
export function minorUnits(code: CurrencyCode): number {
  const c = normaliseCode(code);
  const record = currencyRecord(c);
  if (!record) throw new Error(`Unknown currency code "${code}"`);
  return record.digits;
}

export function isCurrencyCode(code: unknown): boolean {
  if (typeof code !== 'string') return false;
  try {
    minorUnits(code);
    return true;
  } catch {
    return false;
  }
}

function assertMinor(minor: number, what = 'amount'): void {
  if (!Number.isSafeInteger(minor)) {
    throw new Error(`The ${what} must be a whole number of minor units, got ${String(minor)}`);
  }
}

const DECIMAL = /^(-?)(\d+)(?:\.(\d+))?$/;

/**
 * Exact parse of a decimal string into minor units, no float on the way: "12.5" USD → 1250,
 * "-3.20" USD → -320, "500" JPY → 500, "1.234" KWD → 1234. Surrounding spaces are ignored.
 * Rejects, with a message a person can act on: more decimals than the currency has (also "12.0" in JPY and
 * "1.500" in USD — trailing zeros are not dropped silently), thousands separators, decimal commas,
 * exponents, a leading "+" or ".", a trailing ".", and values beyond Number.MAX_SAFE_INTEGER minor units.
 */
export function toMinor(decimal: string, code: CurrencyCode): number {
  const digits = minorUnits(code);
  const cur = normaliseCode(code);
  if (typeof decimal !== 'string') throw new Error(`Enter the amount as text, such as "12.50"`);
  const s = decimal.trim();
  const m = DECIMAL.exec(s);
  if (!m) {
    if (s === '') throw new Error('Enter an amount.');
    if (/^-?\d{1,3}([,'\u00a0 ]\d{3})+(\.\d+)?$/.test(s)) {
      throw new Error(`"${decimal}" has thousands separators; write the amount without them, such as "1234.50"`);
    }
    if (/^-?\d+,\d+$/.test(s)) {
      throw new Error(`"${decimal}" uses a decimal comma; write the amount with a point, such as "12.50"`);
    }
    throw new Error(`"${decimal}" is not an amount; write digits with an optional point, such as "12.50"`);
  }
  const [, sign, whole, frac = ''] = m;
  if (frac.length > digits) {
    throw new Error(
      digits === 0
        ? `${cur} has no minor units; write a whole number such as "${whole}"`
        : `${cur} has ${digits} decimal place${digits === 1 ? '' : 's'}; "${decimal}" has ${frac.length}`,
    );
  }
  const big = BigInt(whole + frac.padEnd(digits, '0'));
  if (big > BigInt(Number.MAX_SAFE_INTEGER)) throw new Error(`"${decimal}" is too large an amount`);
  const n = Number(big);
  return sign === '-' && n !== 0 ? -n : n;
}

/** Minor units → plain decimal string with exactly the ISO digits: 1250 USD → "12.50", -5 USD → "-0.05", 500 JPY → "500". */
export function fromMinor(minor: number, code: CurrencyCode): string {
  const digits = minorUnits(code);
  assertMinor(minor);
  const neg = minor < 0;
  const abs = String(Math.abs(minor));
  if (digits === 0) return (neg ? '-' : '') + abs;
  const padded = abs.padStart(digits + 1, '0');
  return `${neg ? '-' : ''}${padded.slice(0, -digits)}.${padded.slice(-digits)}`;
}

/**
 * Locale display through Intl.NumberFormat, with the fraction digits forced to the ISO digits so no
 * minor unit is ever hidden: HUF 1234.50 shows as "HUF 1,234.50" (Intl alone would print "HUF 1,235").
 * The value goes to Intl as a decimal string, so even amounts past 2^53 / 10^digits are shown exactly.
 * Output depends on the engine's ICU data (spaces, symbols), so never compare or store formatted text.
 */
export function formatMoney(minor: number, code: CurrencyCode, locale = 'en'): string {
  const digits = minorUnits(code);
  const nf = new Intl.NumberFormat(locale, {
    style: 'currency',
    currency: normaliseCode(code),
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
  });
  return nf.format(fromMinor(minor, code) as Intl.StringNumericLiteral);
}

// ---------------------------------------------------------------------------------------------
// Integer arithmetic with the one rounding rule.

/** round(n / d), half away from zero, exact (BigInt). d must be a non-zero integer. */
export function divRound(n: bigint, d: bigint): bigint {
  if (d === 0n) throw new Error('Division by zero');
  if (d < 0n) {
    n = -n;
    d = -d;
  }
  const neg = n < 0n;
  const a = neg ? -n : n;
  const q = (a * 2n + d) / (2n * d); // floor((a + d/2) / d) = half up on the magnitude
  return neg ? -q : q;
}

/** round(a · b / c) half away from zero, for safe integers a, b, c; throws if the result is not a safe integer. */
export function mulDiv(a: number, b: number, c: number): number {
  for (const [v, name] of [
    [a, 'first factor'],
    [b, 'second factor'],
    [c, 'divisor'],
  ] as const) {
    if (!Number.isSafeInteger(v)) throw new Error(`mulDiv: the ${name} must be a safe integer, got ${String(v)}`);
  }
  const r = divRound(BigInt(a) * BigInt(b), BigInt(c));
  if (r > BigInt(Number.MAX_SAFE_INTEGER) || r < -BigInt(Number.MAX_SAFE_INTEGER)) {
    throw new Error('mulDiv: the result is too large');
  }
  return Number(r);
}

/** `basisPoints` / 10 000 of an amount (1 bp = 0.01 %; 5000 = 50 %), rounded half away from zero, once. */
export function percentOf(minor: number, basisPoints: number): number {
  assertMinor(minor);
  if (!Number.isSafeInteger(basisPoints)) throw new Error(`Basis points must be a whole number, got ${basisPoints}`);
  return mulDiv(minor, basisPoints, 10_000);
}

/**
 * The tax inside a tax-inclusive gross amount: gross · rate / (10 000 + rate), half away from zero.
 * 1200 gross at 2000 bp (20 %) → 200.
 */
export function taxIncluded(grossMinor: number, rateBasisPoints: number): number {
  assertMinor(grossMinor);
  if (!Number.isSafeInteger(rateBasisPoints) || rateBasisPoints < 0) {
    throw new Error(`A tax rate must be whole, non-negative basis points, got ${rateBasisPoints}`);
  }
  return mulDiv(grossMinor, rateBasisPoints, 10_000 + rateBasisPoints);
}

/**
 * Split `total` into parts proportional to non-negative integer `weights` so that the parts sum to `total`
 * exactly (largest-remainder method): each part gets floor(total · w / Σw); the units left over go one each
 * to the largest remainders, ties to the earlier index. All weights zero → the whole total goes to the first
 * part (or throws for an empty list with a non-zero total). Deterministic; `total` must be ≥ 0.
 */
export function allocate(total: number, weights: readonly number[]): number[] {
  assertMinor(total, 'total');
  if (total < 0) throw new Error('allocate: the total must not be negative');
  for (const w of weights) {
    if (!Number.isSafeInteger(w) || w < 0) throw new Error(`allocate: weights must be non-negative integers, got ${w}`);
  }
  if (weights.length === 0) {
    if (total !== 0) throw new Error('allocate: nothing to allocate to');
    return [];
  }
  const sum = weights.reduce((s, w) => s + BigInt(w), 0n);
  if (sum === 0n) return weights.map((_, i) => (i === 0 ? total : 0));
  const t = BigInt(total);
  const parts = weights.map((w) => (t * BigInt(w)) / sum);
  const rems = weights.map((w, i) => ({ i, r: (t * BigInt(w)) % sum }));
  let left = t - parts.reduce((s, p) => s + p, 0n);
  rems.sort((x, y) => (x.r === y.r ? x.i - y.i : x.r > y.r ? -1 : 1));
  for (let k = 0; left > 0n; k++, left--) parts[rems[k].i] += 1n;
  return parts.map(Number);
}

/** Round to the nearest multiple of `step` (a positive integer), half away from zero: (5125, 10) → 5130. */
export function roundToStep(minor: number, step: number): number {
  assertMinor(minor);
  if (!Number.isSafeInteger(step) || step <= 0) throw new Error(`A rounding step must be a positive integer, got ${step}`);
  return mulDiv(mulDiv(minor, 1, step), step, 1);
}

// ---------------------------------------------------------------------------------------------
// The payment service's amount rules (../shared/reference/stripe_currency_decimals.tsv, from the
// payment service's "Supported currencies" documentation).

const ZERO_DECIMAL = new Set(['BIF', 'CLP', 'DJF', 'GNF', 'JPY', 'KMF', 'KRW', 'MGA', 'PYG', 'RWF', 'VND', 'VUV', 'XAF', 'XOF', 'XPF']);
const THREE_DECIMAL = new Set(['BHD', 'JOD', 'KWD', 'OMR', 'TND']);
// Listed as zero-decimal in use but, for backwards compatibility, sent as two-decimal amounts whose
// last two digits are 00 ("to charge 5 UGX, provide an amount value of 500"; ISK the same since 2023-04-14).
const TWO_DECIMAL_WHOLE = new Set(['ISK', 'UGX']);

export type ChargeRule = {
  /** decimal exponent of the integer the payment API expects */
  exponent: number;
  /** the API amount must be a multiple of this */
  step: number;
  /** the same step expressed in our (ISO) minor units; deposits are rounded to it so they charge exactly */
  minorStep: number;
};

/**
 * How the payment service wants an amount in `code`. Currencies it does not single out are two-decimal
 * ("Currencies are two-decimal currencies unless otherwise specified"); a code whose ISO digits are not
 * 2 and which the service does not single out (IQD, LYD, CLF, ...) throws, because converting it would be a guess.
 */
export function chargeRule(code: CurrencyCode): ChargeRule {
  const iso = minorUnits(code);
  const c = normaliseCode(code);
  if (ZERO_DECIMAL.has(c)) return { exponent: 0, step: 1, minorStep: 10 ** iso };
  if (THREE_DECIMAL.has(c)) return { exponent: 3, step: 10, minorStep: 10 };
  if (TWO_DECIMAL_WHOLE.has(c)) return { exponent: 2, step: 100, minorStep: 10 ** iso };
  if (iso !== 2) throw new Error(`The payment service's amount rule for ${c} is not known, so ${c} cannot be charged`);
  return { exponent: 2, step: 1, minorStep: 1 };
}

/**
 * Our minor units → the integer the payment API expects for a charge or refund.
 * - two-decimal (USD, EUR, HUF, TWD, ...): unchanged, 1050 → 1050;
 * - zero-decimal (JPY, KRW, ...): unchanged, ¥500 → 500; MGA (ISO 2 digits, the service 0) → whole ariary;
 * - ISK, UGX (ISO 0 digits, the service 2 with "00" at the end): ×100, 5 ISK → 500;
 * - three-decimal (BHD, JOD, KWD, OMR, TND): the last digit must be 0, so rounded to the nearest ten,
 *   half away from zero: 5124 → 5120, 5125 → 5130.
 * Amounts must be ≥ 0. Any rounding is reported by `chargeRoundingDifference`.
 */
export function chargeAmount(minor: number, code: CurrencyCode): number {
  assertMinor(minor);
  if (minor < 0) throw new Error('A charge cannot be negative');
  const iso = minorUnits(code);
  const rule = chargeRule(code);
  const shift = rule.exponent - iso;
  const scaled = shift >= 0 ? mulDiv(minor, 10 ** shift, 1) : mulDiv(minor, 1, 10 ** -shift);
  return roundToStep(scaled, rule.step);
}

/** The payment API's integer → our minor units (for reading amounts back from payment events). */
export function fromChargeAmount(apiAmount: number, code: CurrencyCode): number {
  assertMinor(apiAmount);
  const iso = minorUnits(code);
  const shift = chargeRule(code).exponent - iso;
  if (shift <= 0) return apiAmount * 10 ** -shift;
  if (apiAmount % 10 ** shift !== 0) throw new Error(`${apiAmount} is not a whole ${normaliseCode(code)} amount`);
  return apiAmount / 10 ** shift;
}

/** What charging `minor` would gain (+) or lose (−) in minor units because of the payment service's step. */
export function chargeRoundingDifference(minor: number, code: CurrencyCode): number {
  return fromChargeAmount(chargeAmount(minor, code), code) - minor;
}
