// The TextMate grammar is generated from the token table; the checked-in copy must not drift
// (regenerate with UPDATE_FIXTURES=1), and its patterns must colour what the lexer produces.
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildTextMateGrammar, KEYWORDS } from '../../grammar/src/index';
import { allTokens, TOKEN_SCOPES } from '../../grammar/src/tokens';

const grammarPath = join(__dirname, '..', '..', 'grammar', 'plant.tmLanguage.json');

/** Oniguruma `\x{XXXX}` back to a JavaScript regex (the only construct we translate). */
function toJavaScript(source: string): RegExp {
  return new RegExp(source.replace(/\\x\{([0-9A-Fa-f]{4})\}/g, '\\u$1'), 'u');
}

describe('TextMate grammar', () => {
  const generated = buildTextMateGrammar();

  it('matches the checked-in plant.tmLanguage.json', () => {
    const text = `${JSON.stringify(generated, null, 2)}\n`;
    if (process.env.UPDATE_FIXTURES === '1' || !existsSync(grammarPath)) {
      if (process.env.UPDATE_FIXTURES !== '1') throw new Error('grammar/plant.tmLanguage.json missing; run with UPDATE_FIXTURES=1');
      writeFileSync(grammarPath, text);
    }
    expect(JSON.parse(readFileSync(grammarPath, 'utf8'))).toEqual(JSON.parse(text));
  });

  it('has scopeName source.plant and a scope for every coloured token', () => {
    expect(generated.scopeName).toBe('source.plant');
    for (const token of allTokens) {
      if (token.name === 'Whitespace' || token.name === 'Newline' || token.name === 'PlainNumberMatrix') continue;
      expect(TOKEN_SCOPES.has(token), token.name).toBe(true);
    }
  });

  it('colours every keyword as a whole word only', () => {
    const keyword = toJavaScript(generated.repository.keyword.patterns[0].match as string);
    for (const word of KEYWORDS) {
      expect(keyword.exec(` ${word} `)?.[0]).toBe(word);
      expect(keyword.exec(`${word}x`)).toBeNull();
    }
  });

  it('colours a number with its unit and an imaginary literal', () => {
    const [imaginary, number] = generated.repository.number.patterns;
    const withUnit = toJavaScript(number.match as string).exec('200 Hz');
    expect(withUnit?.[1]).toBe('200');
    expect(withUnit?.[2]).toBe('Hz');
    expect(toJavaScript(number.match as string).exec('2 sin')?.[2]).toBeUndefined();
    expect(toJavaScript(imaginary.match as string).exec('1e-3j')?.[0]).toBe('1e-3j');
  });

  it('has a valid language configuration', () => {
    const configuration = JSON.parse(
      readFileSync(join(__dirname, '..', '..', 'grammar', 'language-configuration.json'), 'utf8'),
    ) as { comments: { lineComment: string }; wordPattern: string };
    expect(configuration.comments.lineComment).toBe('#');
    const word = new RegExp(configuration.wordPattern);
    expect(word.exec("theta' = omega")?.[0]).toBe("theta'");
    expect(word.exec('ω0 = 2')?.[0]).toBe('ω0');
  });
});
