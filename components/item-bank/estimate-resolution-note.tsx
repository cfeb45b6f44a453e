/**
 * Why the estimates repeat: the calibration block asks a handful of questions per magnitude,
 * each a tie at one rate on a log-spaced grid. Everyone who switches between the same two
 * questions gets the same maximum-likelihood estimate, so the estimates fall on a few values.
 */
export function EstimateResolutionNote() {
  return (
    <p className="mb-3 text-xs text-ink-soft" data-testid="estimate-resolution">
      Why the same estimates repeat: the calibration block asks a few questions per reward size, each a tie at one rate on a log-spaced grid. Everyone who switches
      from the later to the sooner reward between the same two questions gets the same estimate, so with n questions per size the estimates of consistent
      participants take at most n + 1 values per size. The calibration block’s resolution, not the people, makes them cluster; SE ln k and SE ln K say how wide
      each estimate is.
    </p>
  );
}
