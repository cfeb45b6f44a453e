/** How the lab's software calls the probe-items API, with a curl example for this study. */
export function ApiDocs({ studyId, origin }: { studyId: number; origin: string }) {
  const curl = [
    `curl -X POST ${origin}/api/v1/studies/${studyId}/probe-items \\`,
    `  -H "Authorization: Bearer $SWITCHBACK_KEY" \\`,
    `  -H "Content-Type: application/json" \\`,
    `  -d '{"participantId": "P-0001", "responses": {"cal-small-01": "later", "cal-small-02": "sooner", "...": "..."}}'`,
  ].join('\n');
  return (
    <div className="space-y-4 text-sm text-ink">
      <p>
        After a participant finishes the calibration block, your survey or experiment software sends their answers and gets back their estimates and their
        personalised probe and anchor items, in the same item format as the export and already in presentation order.
      </p>
      <pre className="overflow-x-auto rounded-md bg-ink px-4 py-3 font-mono text-xs text-paper" data-testid="curl-example">
        {curl}
      </pre>
      <ul className="list-disc space-y-1 pl-5">
        <li>
          <strong>responses</strong>: every calibration item id from the export, each <code>&quot;sooner&quot;</code> or <code>&quot;later&quot;</code>; the attention check{' '}
          <code>check-calibration</code> may be included.
        </li>
        <li>
          <strong>Reply</strong>: <code>estimates</code> (kSmall and kLarge per day, standard error of ln k, flags), <code>extrapolation</code> (a warning when probe delays go
          far beyond the calibration delays), <code>flag</code>, <code>itemSet</code> and <code>items</code>.
        </li>
        <li>
          <strong>Flagged answers</strong> (all sooner, all later, inconsistent, or no reversal zone at the estimates) get the fallback set from the exported file and the flag.
        </li>
        <li>
          <strong>Repeats are safe</strong>: the same participant with the same answers gets the same items; different answers for a participant already served give 409.
        </li>
        <li>
          <strong>Errors</strong>: 401 missing or revoked key · 404 key of another study · 422 names the item ids at fault · 429 too many requests (wait for{' '}
          <code>Retry-After</code> seconds). The rate limit counts per key and per server process.
        </li>
      </ul>
      <p>
        The full description is the OpenAPI 3.1 document at{' '}
        <a className="text-teal-700 underline" href="/api/v1/openapi.json">
          /api/v1/openapi.json
        </a>
        .
      </p>
    </div>
  );
}
