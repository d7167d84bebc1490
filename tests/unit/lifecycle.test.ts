import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  allowedTransitions,
  canTransition,
  commissionStatuses,
  currentStage,
  progressOf,
  refusedTransitionMessage,
  stageEstimates,
  waitUntil,
  type CommissionStatus,
} from '../../shared/commission-lifecycle';
import { defaultStageTemplate, hazardsForStage, hazardsOfTechniques, SAFETY_FOOTER, stageHazards, stripFooter, withFooter } from '../../shared/hazards';
import { keyFromLabel } from '../../shared/schemas/commissions';

describe('commission lifecycle', () => {
  // The moves of the issue-3 contract, written out by hand.
  const expected: Record<Exclude<CommissionStatus, 'on_hold'>, CommissionStatus[]> = {
    enquiry: ['quoted', 'cancelled', 'on_hold'],
    quoted: ['booked', 'enquiry', 'cancelled', 'on_hold'],
    booked: ['on_bench', 'cancelled', 'on_hold'],
    on_bench: ['ready_to_ship', 'cancelled', 'on_hold'],
    ready_to_ship: ['shipped', 'on_bench', 'on_hold'],
    shipped: ['closed'],
    closed: [],
    cancelled: [],
  };

  it.each(Object.entries(expected))('from %s allows exactly %j', (from, to) => {
    expect(allowedTransitions(from as CommissionStatus).sort()).toEqual([...to].sort());
  });

  it('refuses every move that is not listed, including staying put', () => {
    for (const from of commissionStatuses) {
      if (from === 'on_hold') continue;
      for (const to of commissionStatuses) {
        expect(canTransition(from, to), `${from} → ${to}`).toBe(expected[from].includes(to));
      }
    }
  });

  it('on hold goes back only to where it came from, or is cancelled', () => {
    expect(allowedTransitions('on_hold', 'booked')).toEqual(['booked', 'cancelled']);
    expect(allowedTransitions('on_hold', 'ready_to_ship')).toEqual(['ready_to_ship', 'cancelled']);
    expect(canTransition('on_hold', 'on_bench', 'booked')).toBe(false);
    expect(canTransition('on_hold', 'quoted', 'booked')).toBe(false);
    // without a remembered status (should not happen) the only way out is cancelling
    expect(allowedTransitions('on_hold', null)).toEqual(['cancelled']);
  });

  it('names the allowed moves when refusing one', () => {
    expect(refusedTransitionMessage('booked', 'shipped')).toBe(
      'A commission that is Booked cannot move to Shipped. It can move to On the bench, Cancelled or On hold.',
    );
    expect(refusedTransitionMessage('closed', 'enquiry')).toBe('A commission that is Closed cannot move to Enquiry. Closed is final.');
    expect(refusedTransitionMessage('on_hold', 'closed', 'quoted')).toContain('It can move to Quoted or Cancelled.');
  });
});

describe('progress', () => {
  const s = (status: 'todo' | 'working' | 'done' | 'skipped', estimateMinutes: number) => ({ status, estimateMinutes });

  it('is the share of estimated hours done', () => {
    expect(progressOf([s('done', 60), s('done', 30), s('working', 90), s('todo', 60)])).toEqual({
      stagesDone: 2,
      stagesTotal: 4,
      hoursDone: 1.5,
      hoursTotal: 4,
      share: 0.375,
    });
  });

  it('leaves skipped stages out of the total', () => {
    expect(progressOf([s('done', 60), s('skipped', 600), s('todo', 60)])).toEqual({ stagesDone: 1, stagesTotal: 2, hoursDone: 1, hoursTotal: 2, share: 0.5 });
  });

  it('falls back to the count of stages when nothing is estimated; all skipped is complete; no stages is zero', () => {
    expect(progressOf([s('done', 0), s('todo', 0), s('todo', 0), s('todo', 0)]).share).toBe(0.25);
    expect(progressOf([s('skipped', 30), s('skipped', 30)]).share).toBe(1);
    expect(progressOf([]).share).toBe(0);
  });

  it('rounds hours to two decimals and the share to three', () => {
    const p = progressOf([s('done', 20), s('todo', 40)]);
    expect(p.hoursDone).toBe(0.33);
    expect(p.share).toBe(0.333);
  });
});

describe('stages', () => {
  it('the current stage is the first not done or skipped, by position', () => {
    const stages = [
      { id: 3, position: 3, status: 'todo' as const },
      { id: 1, position: 1, status: 'done' as const },
      { id: 2, position: 2, status: 'skipped' as const },
      { id: 4, position: 4, status: 'working' as const },
    ];
    expect(currentStage(stages)?.id).toBe(3);
    expect(currentStage(stages.map((x) => ({ ...x, status: 'done' as const })))).toBeNull();
  });

  it('a wait ends the given minutes after the stage was done', () => {
    expect(waitUntil('2026-03-02T09:00:00.000Z', 120)).toBe('2026-03-02T11:00:00.000Z');
    expect(waitUntil('2026-03-02T09:00:00.000Z', 0)).toBeNull();
    expect(waitUntil(null, 120)).toBeNull();
  });

  it('estimates are the template minutes times the quantity, unless hours per stage are given', () => {
    const template = [
      { key: 'prime', defaultMinutes: 6 },
      { key: 'basecoat', defaultMinutes: 30 },
    ];
    expect(stageEstimates(template, 10)).toEqual({ prime: 60, basecoat: 300 });
    expect(stageEstimates(template, 10, { basecoat: 200 })).toEqual({ prime: 60, basecoat: 200 });
  });

  it('makes keys from labels', () => {
    expect(keyFromLabel('Layer & highlight')).toBe('layer-highlight');
    expect(keyFromLabel('Öl-Lasur')).toBe('ol-lasur');
    expect(keyFromLabel('3D print cleanup')).toBe('x-3d-print-cleanup');
  });
});

describe('hazards', () => {
  it('brush-only stages carry no caution; sprayed, glued, resin and weathering stages do', () => {
    for (const k of ['basecoat', 'shade', 'layer', 'glaze', 'details']) expect(stageHazards[k], k).toEqual([]);
    expect(stageHazards.prime).toEqual(['spray']);
    expect(stageHazards.varnish).toEqual(['spray']);
    expect(stageHazards.assembly).toEqual(['superglue']);
    expect(stageHazards.prep).toEqual(['resin']);
    expect(stageHazards.weathering).toEqual(['solvent', 'pigment']);
  });

  it('techniques add their hazards to a stage: an airbrushed basecoat carries the spray caution', () => {
    expect(hazardsOfTechniques(['brush', 'drybrush'])).toEqual([]);
    expect(hazardsForStage(stageHazards.basecoat, ['airbrush'])).toEqual(['spray']);
    expect(hazardsForStage(['pigment'], ['oil-wash', 'airbrush', 'unknown-technique'])).toEqual(['spray', 'solvent', 'pigment']);
  });

  it('shows the closing sentence once, however often a text goes round', () => {
    const t = withFooter('Ventilate.');
    expect(t).toBe(`Ventilate. ${SAFETY_FOOTER}`);
    expect(withFooter(t)).toBe(t);
    expect(stripFooter(t)).toBe('Ventilate.');
  });

  // Waits of the default template against ../shared/reference/acrylic_drying_dilution.tsv.
  it('default waits are no shorter than the published recoat times', () => {
    const tsv = fs.readFileSync(new URL('../../../shared/reference/acrylic_drying_dilution.tsv', import.meta.url), 'utf8');
    const rows = tsv
      .split('\n')
      .filter((l) => l && !l.startsWith('#'))
      .map((l) => l.split('\t'));
    const hoursOf = (material: string, property: string) => {
      const r = rows.find((x) => x[0] === material && x[1] === property);
      expect(r, `${material} / ${property}`).toBeDefined();
      expect(r![3]).toBe('hour');
      return Number(r![2].replace('>=', ''));
    };
    const wait = (key: string) => defaultStageTemplate.find((s) => s.key === key)!.waitMinutes / 60;
    // GOLDEN / Just Paint, "Suggested Drying Times Between Acrylic Products" (source 2): gesso recoat >= 1 hour
    expect(wait('prime')).toBeGreaterThanOrEqual(hoursOf('acrylic gesso (primer)', 'recoat'));
    // Jo Sonja matte varnish directions (source 6): recoat after >= 1 hour
    expect(wait('varnish')).toBeGreaterThanOrEqual(hoursOf('water-based matte varnish', 'recoat'));
    // Liquitex "Drying Time" (source 5): acrylic recoat when touch-dry, so brush stages have no fixed wait
    expect(rows.find((x) => x[0] === 'acrylic paint (artists, water-based)' && x[1] === 'recoat')?.[2]).toBe('when touch-dry');
    expect(wait('basecoat')).toBe(0);
  });
});
