/** How the lab's software runs a two-stage session through the API, with curl examples for this study. */
export function ApiDocs({ studyId, origin }: { studyId: number; origin: string }) {
  const curl = [
    `curl -X POST ${origin}/api/v1/studies/${studyId}/probe-items \\`,
    `  -H "Authorization: Bearer $SWITCHBACK_KEY" \\`,
    `  -H "Content-Type: application/json" \\`,
    `  -d '{"participantId": "P-0001", "responses": {"cal-small-01": "later", "cal-small-02": "sooner", "...": "..."}}'`,
  ].join('\n');
  const session = [
    `# 1. the calibration block, as your key presents it (starts the participant's session)`,
    `curl "${origin}/api/v1/studies/${studyId}/calibration?participantId=P-0001" -H "Authorization: Bearer $SWITCHBACK_KEY"`,
    `# 3. the stage-2 answers, in one or several parts`,
    `curl -X POST ${origin}/api/v1/studies/${studyId}/stage2-answers -H "Authorization: Bearer $SWITCHBACK_KEY" -H "Content-Type: application/json" \\`,
    `  -d '{"participantId": "P-0001", "answers": [{"itemId": "probe-1-far", "chosen": "later", "responseTimeMs": 2140, "sideShown": "left"}]}'`,
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
      <p>The whole session: fetch the calibration block (1), send its answers for the stage-2 items (2, above), send the stage-2 answers back (3).</p>
      <pre className="overflow-x-auto rounded-md bg-ink px-4 py-3 font-mono text-xs text-paper" data-testid="session-example">
        {session}
      </pre>
      <ul className="list-disc space-y-1 pl-5">
        <li>
          <strong>Item bank</strong>: a key presents and scores the items of its delay unit, gap and seed; the calibration reply and an export with the same
          settings show the same <code>itemBankId</code>. Send it with the calibration answers: answers to another item bank are refused, never rescored.
        </li>
        <li>
          <strong>Stage-2 length varies</strong>: personalised pairs are built around each person&apos;s reversal zone, and anchors that do not fit are left out; use
          the <code>items</code> array as given.
        </li>
        <li>
          <strong>Stage-2 answers</strong>: idempotent; a changed answer gives 409 and the first stays; items not served to the participant, or answers before the
          calibration answers, give 422. A participant who stops keeps what they answered.
        </li>
        <li>
          <strong>Browser keys</strong> run sessions from a public page: only from their listed origins (every reply carries the CORS headers), with their own rate
          limit, and per participant with the session token the calibration reply hands out once (send it as <code>X-Session-Token</code>).
        </li>
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
          <strong>Errors</strong>: 401 missing or revoked key · 403 origin not listed or session token missing · 404 key of another study · 422 names the item ids at fault · 429 too many requests (wait for{' '}
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
