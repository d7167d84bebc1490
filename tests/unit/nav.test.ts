import { describe, expect, it } from 'vitest';
import { STUDIO_NAV, navItemIsCurrent } from '../../src/app/nav';

const current = (rest: string) => STUDIO_NAV.filter((item) => navItemIsCurrent(item, rest)).map((item) => item.label);

describe('the studio rail marks one entry as current', () => {
  it.each([
    ['', ['Home']],
    ['bench', ['Bench']],
    ['commissions/12', ['Commissions']],
    // A commission's quotes and cancel screens stay with Commissions.
    ['commissions/12/quotes', ['Commissions']],
    ['money', ['Quotes & invoices']],
    ['money/prices', ['Quotes & invoices']],
    ['quotes/4', ['Quotes & invoices']],
    ['invoices', ['Quotes & invoices']],
    ['invoices/9/paid', ['Quotes & invoices']],
    ['reports', ['Quotes & invoices']],
    ['paints/recipes/3', ['Paints & recipes']],
    ['calendar/capacity', ['Calendar']],
    // A prefix is not enough: 'benchmarks' is not the bench.
    ['benchmarks', []],
  ])('%s → %j', (rest, labels) => {
    expect(current(rest)).toEqual(labels);
  });
});
