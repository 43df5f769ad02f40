/**
 * Every source the code and the tests cite is in docs/references.md: author–year keys such as
 * `[medhurst1947]` must appear there, and `refs §N.M` must name one of its sections (a `## N.`
 * heading) and, for N.M, an entry marked `refs §N.M`. The rule is ours (DEVELOPERS.md).
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const FOLDERS = ['core', 'optimize', 'workers', 'run', 'cli', 'api', 'test', 'bench'];
const KEY = /\[[a-z][a-z0-9-]*[0-9]{2,4}[a-z]?\]/g;
const SECTION = /refs §([0-9]+)(?:\.([0-9]+))?/g;

function files(folder: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(folder)) {
    const path = join(folder, name);
    if (statSync(path).isDirectory()) out.push(...files(path));
    else if (/\.(ts|py)$/.test(name)) out.push(path);
  }
  return out;
}

/** This file, whose counter-example cites what the list does not hold. */
const SELF = join('test', 'architecture', 'references.test.ts');
const references = readFileSync('docs/references.md', 'utf8');

/** The citations of a text that docs/references.md does not hold. */
function unresolved(text: string): string[] {
  const missing: string[] = [];
  for (const [key] of text.matchAll(KEY)) if (!references.includes(key)) missing.push(key);
  for (const [cite, major, minor] of text.matchAll(SECTION)) {
    const heading = new RegExp(`^## ${major}\\. `, 'm').test(references);
    if (!heading || (minor !== undefined && !references.includes(`refs §${major}.${minor}`))) missing.push(cite);
  }
  return missing;
}

describe('docs/references.md', () => {
  it('holds every key and section that the code and the tests cite', () => {
    const missing: string[] = [];
    const cited = [...FOLDERS.flatMap(files), 'README.md', 'DEVELOPERS.md'].filter((file) => file !== SELF);
    for (const file of cited)
      for (const cite of unresolved(readFileSync(file, 'utf8'))) missing.push(`${file}: ${cite}`);
    expect([...new Set(missing)]).toEqual([]);
  });

  it('a citation it does not hold is found (a check that can fail)', () => {
    expect(unresolved('see [nobody1066] and refs §99.1')).toEqual(['[nobody1066]', 'refs §99.1']);
  });
});
