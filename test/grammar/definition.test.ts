// The shared parser skips Chevrotain's grammar validations to start faster; this runs them.
import { describe, expect, it } from 'vitest';
import { validateGrammar } from '../../grammar/src/parser';

describe('grammar definition', () => {
  it("passes Chevrotain's own validations (no ambiguity, left recursion or unreachable rule)", () => {
    expect(() => validateGrammar()).not.toThrow();
  });
});
