import { describe, expect, it } from 'vitest';
import { scrubber, scrubJson, scrubValue } from '../../server/features/privacy/scrub';

describe('scrubber', () => {
  const scrub = scrubber(['Ash Vale', 'ash.vale@privacy.test', 'Ash'], 'Erased client 7');

  it('replaces whole words in any case, the longest name first', () => {
    expect(scrub('Thanks, ash vale! Ash sends ash.vale@privacy.test.')).toBe('Thanks, Erased client 7! Erased client 7 sends Erased client 7.');
  });

  it('leaves words that only contain a name alone', () => {
    expect(scrub('Ashen bases, washed with ashes; Cash.')).toBe('Ashen bases, washed with ashes; Cash.');
  });

  it('finds the HTML-escaped form of a name too', () => {
    const html = scrubber(["Ren O'Dell"], 'X');
    expect(html('<p>Hello Ren O&#39;Dell,</p>')).toBe('<p>Hello X,</p>');
  });

  it('ignores empty and one-letter needles instead of replacing every letter', () => {
    const s = scrubber(['', ' ', 'A', null, undefined], 'X');
    expect(s('A banner')).toBe('A banner');
  });
});

describe('scrubJson', () => {
  const scrub = scrubber(['Ash Vale'], 'P');

  it('walks parsed JSON and nulls the free-text keys it is told to drop', () => {
    const detail = JSON.stringify({ title: 'Ash Vale knights', changes: { brief: { from: 'a', to: 'b' }, dueDate: { from: '2026-01-01', to: null } }, figureName: 'Ash Vale banner' });
    expect(JSON.parse(scrubJson(detail, scrub, new Set(['title', 'brief']))!)).toEqual({ title: null, changes: { brief: null, dueDate: { from: '2026-01-01', to: null } }, figureName: 'P banner' });
  });

  it('treats text that is not JSON as text, and keeps null', () => {
    expect(scrubJson('not json, Ash Vale', scrub)).toBe('not json, P');
    expect(scrubJson(null, scrub)).toBeNull();
  });

  it('keeps numbers and booleans as they are', () => {
    expect(scrubValue([1, true, null, 'Ash Vale'], scrub)).toEqual([1, true, null, 'P']);
  });
});
