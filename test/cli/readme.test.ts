import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { METRIC_KEYS } from '../../core/metrics.ts';
import { DESIGN_SECTIONS, type SectionSpec } from '../../cli/design-fields.ts';
import { SAFETY_CAUTIONS } from '../../cli/safety.ts';

const readme = readFileSync('README.md', 'utf8');

describe('README.md', () => {
  it('opens with the job, then the two set-up commands, then the safety cautions', () => {
    const demo = readme.indexOf('npm ci && npm run demo');
    const test = readme.indexOf('npm test');
    const safety = readme.indexOf('## Safety');
    expect(demo).toBeGreaterThan(0);
    expect(test).toBeGreaterThan(demo);
    expect(safety).toBeGreaterThan(test);
    for (const word of ['lethal', 'burns', 'fire', 'ozone', 'medical', 'radio', 'electrical codes'])
      expect(readme).toContain(word);
  });

  it('documents every metric of the contract', () => {
    for (const key of METRIC_KEYS) expect(readme).toContain(`\`${key}\``);
  });

  it('documents every section, sub-section and field of the design file', () => {
    const documented = (name: string, section: SectionSpec): void => {
      expect(readme).toContain(`\`${name}:\``);
      for (const key of Object.keys(section.fields)) expect(readme).toContain(`\`${key}\``);
      for (const form of Object.values(section.variants?.forms ?? {}))
        for (const key of Object.keys(form)) expect(readme).toContain(`\`${key}\``);
      for (const [key, sub] of Object.entries(section.subsections ?? {})) documented(`${name}.${key}`, sub);
    };
    for (const [name, section] of Object.entries(DESIGN_SECTIONS)) documented(name, section);
  });

  it('the report cautions name the same dangers', () => {
    const text = SAFETY_CAUTIONS.join(' ');
    for (const word of ['lethal', 'burns', 'fires', 'ozone', 'medical implants', 'radio services', 'electrical'])
      expect(text).toContain(word);
  });

  it('writes every command as npx coilfront, the name that works right after npm ci', () => {
    const bare = readme
      .split('\n')
      .filter((line) => /(^|[`|] ?)coilfront (evaluate|check|schema|sweep|evolve|refine|show|merge)\b/.test(line));
    expect(bare).toEqual([]);
    const hints = readdirSync('cli')
      .filter((name) => name.endsWith('.ts'))
      .flatMap((name) =>
        readFileSync(`cli/${name}`, 'utf8')
          .split('\n')
          .filter(
            (line) =>
              !/^\s*(\*|\/\/)/.test(line) &&
              /(?<![-\w'])(?<!npx )coilfront (show|evaluate|check|sweep|evolve|refine)\b/.test(line),
          ),
      );
    expect(hints).toEqual([]);
  });

  it('npx coilfront runs from the checkout without a network (the package bin of package.json)', () => {
    const version = execFileSync('npx', ['--no-install', 'coilfront', '--version'], { encoding: 'utf8' }).trim();
    const pkg = JSON.parse(readFileSync('package.json', 'utf8')) as { version: string };
    expect(version).toBe(pkg.version);
  });
});
