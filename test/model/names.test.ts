// Name suggestions by edit distance.
import { describe, expect, it } from 'vitest';
import { editDistance, suggestName } from '../../server/src/model/names';

describe('edit distance', () => {
  it('counts insertions, deletions, substitutions and adjacent transpositions', () => {
    expect(editDistance('omega', 'omega')).toBe(0);
    expect(editDistance('omga', 'omega')).toBe(1);
    expect(editDistance('omegaa', 'omega')).toBe(1);
    expect(editDistance('omeja', 'omega')).toBe(1);
    expect(editDistance('omgea', 'omega')).toBe(1);
    expect(editDistance('kitten', 'sitting')).toBe(3); // the classic example (Levenshtein 1966, from memory)
  });
});

describe('suggestions', () => {
  it('offers the closest plausible name', () => {
    expect(suggestName('omgea', ['theta', 'omega', 'current'])).toBe('omega');
    expect(suggestName('Theta', ['theta', 'omega'])).toBe('theta');
    expect(suggestName('curent', ['current', 'predictor'])).toBe('current');
  });

  it('stays silent when nothing is close, and for unrelated one-letter names', () => {
    expect(suggestName('speed', ['theta', 'omega'])).toBeUndefined();
    expect(suggestName('b', ['a', 'J'])).toBeUndefined();
    expect(suggestName('j', ['J'])).toBe('J');
  });
});
