/**
 * docs/bundles.md: modules under shared/ and src/ import zod as a namespace
 * (`import * as z from 'zod'`). One named `import { z } from 'zod'` makes
 * esbuild keep all of zod (every locale included) in that bundle: measured
 * this session, the kinematics worker went from 97 kB to 45 kB gzip once the
 * last two such imports were gone. Server-only code may import as it likes.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../..', import.meta.url));

function tsFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return tsFiles(p);
    return p.endsWith('.ts') && !p.endsWith('.spec.ts') ? [p] : [];
  });
}

describe('browser bundle rules', () => {
  it('no module the browser can load imports zod by name', () => {
    const files = [...tsFiles(join(root, 'shared')), ...tsFiles(join(root, 'src'))];
    expect(files.length).toBeGreaterThan(50);
    const named = files.filter((f) => /import\s*\{[^}]*\}\s*from\s*['"]zod['"]/.test(readFileSync(f, 'utf8').replace(/import\s+type\s*\{[^}]*\}\s*from\s*['"]zod['"]/g, '')));
    expect(named.map((f) => relative(root, f))).toEqual([]);
  });
});
