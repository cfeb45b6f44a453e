import type { DesignVersion, Study } from '@/db/models';
import { BROWSER_KEY_PLACEHOLDER, starterRuntime, type StarterConfig } from '@/lib/shared/starter-runtime';

/** JSON safe inside a <script> element: no `</script>` or `<!--` can close it early. */
function scriptJson(value: unknown): string {
  return JSON.stringify(value, null, 2).replace(/</g, '\\u003c').replace(/\u2028/g, '\\u2028').replace(/\u2029/g, '\\u2029');
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/**
 * The ready-to-host starter experiment of one frozen version: one static HTML file (plain
 * JavaScript, no library) that runs the whole two-stage session against this server's session API
 * with a browser key, from any origin the key lists. The settings the lab may edit sit in one
 * object at the top of the script; the participant id arrives as the `participantId` query parameter.
 */
export function starterHtml(options: { study: Pick<Study, 'id' | 'name'>; version: Pick<DesignVersion, 'id' | 'number' | 'hash' | 'content'>; apiBase: string }): string {
  const { study, version } = options;
  const config: StarterConfig = {
    apiBase: options.apiBase,
    studyId: study.id,
    designVersionId: version.id,
    browserKey: BROWSER_KEY_PLACEHOLDER,
    calibrationOrder: 'bank',
    title: study.name,
    instructions:
      'You will see a series of choices between two amounts of money, one sooner and one later. There are no right or wrong answers: ' +
      'choose the option you would prefer. Take each choice on its own.',
    thanks: 'Thank you: your answers have been recorded. You may close this page.',
  };
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(study.name)}</title>
<!--
  Switchback starter experiment · study ${study.id} · design version ${version.number} (hash ${version.hash}).
  Host this file on a site whose origin the browser key lists (API keys page). Send participants to it as
  …/this-file.html?participantId=<their id>. Edit the settings below (wording, key, calibration order).
  Choices are hypothetical unless your ethics board approved real rewards; the estimates Switchback
  derives from them are estimates from choices, not a clinical assessment.
-->
<style>
  body { font-family: system-ui, sans-serif; margin: 0; padding: 1.5rem; color: #1d1d1f; background: #fafaf7; line-height: 1.5; }
  #switchback-root { max-width: 40rem; margin: 0 auto; }
  .options { display: flex; flex-wrap: wrap; gap: 1rem; margin-top: 1.5rem; }
  .options button, #start { flex: 1 1 14rem; min-height: 3.5rem; font-size: 1.15rem; padding: 0.75rem 1rem; border: 2px solid #33506b; border-radius: 0.5rem; background: #fff; color: #1d1d1f; cursor: pointer; }
  .options button:focus-visible, #start:focus-visible { outline: 3px solid #c2410c; outline-offset: 2px; }
  .options button:disabled { opacity: 0.6; cursor: default; }
  .progress, .notice { color: #555; font-size: 0.95rem; }
</style>
</head>
<body>
<main id="switchback-root" aria-live="polite"><p>Loading…</p></main>
<script>
const SWITCHBACK_SETTINGS = ${scriptJson(config)};
(${starterRuntime.toString()})(SWITCHBACK_SETTINGS);
</script>
</body>
</html>
`;
}

/** A file name for the starter of a version. */
export function starterFileName(study: Pick<Study, 'id'>, version: Pick<DesignVersion, 'number' | 'hash'>): string {
  return `switchback-starter-${study.id}-v${version.number}-${version.hash.slice(0, 12)}.html`;
}
