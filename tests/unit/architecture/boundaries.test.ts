import { createRequire } from 'node:module';
import path from 'node:path';
import { cruise, type ICruiseResult, type IConfiguration } from 'dependency-cruiser';
import { describe, expect, it } from 'vitest';

// The rules `npm run lint` enforces (.dependency-cruiser.cjs), run over a miniature of the
// repository's folders (tests/fixtures/boundaries) that holds one breach of each rule beside
// imports the rules allow. If a rule stops firing, or starts refusing an allowed import, this fails.
const config = createRequire(import.meta.url)('../../../.dependency-cruiser.cjs') as IConfiguration;
const FIXTURE = path.resolve(__dirname, '../../fixtures/boundaries');

async function violations(): Promise<string[]> {
  const previous = process.cwd();
  process.chdir(FIXTURE); // dependency-cruiser resolves and reports paths from the working folder
  try {
    const reporting = await cruise(['lib', 'db'], { ruleSet: { forbidden: config.forbidden }, validate: true, tsPreCompilationDeps: true });
    const output = reporting.output as ICruiseResult;
    return output.summary.violations.map((v) => `${v.rule.name}: ${v.from} → ${v.to}`).sort();
  } finally {
    process.chdir(previous);
  }
}

describe('architecture boundaries (npm run lint)', () => {
  it('refuses each kind of breach and nothing the layering allows', async () => {
    expect(await violations()).toEqual(
      [
        'client-not-server: lib/client/studies.ts → lib/server/services/studies.ts',
        'core-halves-through-index: lib/criteria/gap.ts → lib/design/discount.ts',
        'core-imports-nothing: lib/design/framework.ts → lib/server/services/studies.ts',
        'db-below-services: db/models/study.ts → lib/server/services/studies.ts',
        'jobs-below-services: lib/server/jobs/pool.ts → lib/server/services/studies.ts',
        'no-cycle: lib/shared/first.ts → lib/shared/second.ts',
        'services-below-http: lib/server/services/studies.ts → lib/server/http/read-body.ts',
        'shared-is-pure: lib/shared/uses-server.ts → lib/server/http/read-body.ts',
      ].sort(),
    );
  });
});
