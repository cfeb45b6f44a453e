import { DesignInputError } from '../DesignInputError';
import { extrapolationWarning } from '../extrapolationWarning';
import { reversalZone } from '../reversalZone';
import type { ModelId } from '../types';
import { checkAligned } from './comparePatterns';
import type { ParticipantRefit } from './refitParticipant';
import type { ParticipantData } from './types';

/** Where a probe's late delay fell against the refitted zone. */
export type ZonePosition = 'before' | 'inside' | 'after' | 'no-zone';

export type ParticipantZone = {
  participantId: string;
  /** refitted zone at the first probe's ratio and soon delay, days; null when empty */
  zone: { lower: number; upper: number } | null;
  probes: Array<{ pairId: string; lateDelay: number; soonDelay: number; position: ZonePosition }>;
  counts: Record<ZonePosition, number>;
  longestCalibrationDelay: number | null;
  longestProbeDelay: number | null;
  /** the probes reach beyond 3 times the longest calibration delay (extrapolationWarning) */
  extrapolated: boolean;
};

export type ZoneDiagnosis = {
  model: ModelId;
  participants: ParticipantZone[];
  /** probes per position, over all participants */
  probes: Record<ZonePosition, number>;
  /** participants whose probes were all inside / mostly before / mostly after / who had no refitted zone */
  allInside: number;
  mostlyBefore: number;
  mostlyAfter: number;
  noZone: number;
  extrapolated: number;
  /** plain-language reading of the counts */
  findings: string[];
};

/**
 * Zone diagnosis: per participant, the reversal zone under `model` refitted to calibration and
 * stage-2 choices (reversalZone at the refitted k, K and s or β, for each probe's own ratio and
 * soon delay) against the probes' late delays: before the zone (D ≤ D_lower: LL expected in
 * both views), inside, or after it (D ≥ D_upper: SS expected in both views). Probes mostly
 * after the zone mean participants were more impatient at these delays than their calibration
 * suggested; mostly before, more patient. Probes reaching beyond 3 times the longest
 * calibration delay are counted as extrapolated (docs/mathematics.md, "Power").
 *
 * @throws DesignInputError when refits do not line up with participants, or lack `model`
 */
export function diagnoseZones(participants: readonly ParticipantData[], refits: readonly ParticipantRefit[], options: { model: ModelId }): ZoneDiagnosis {
  checkAligned(participants, refits);
  const id = options?.model;
  const result: ZoneDiagnosis = { model: id, participants: [], probes: blank(), allInside: 0, mostlyBefore: 0, mostlyAfter: 0, noZone: 0, extrapolated: 0, findings: [] };
  participants.forEach((participant, i) => {
    const fit = refits[i].models.find((m) => m.model === id);
    if (!fit) throw new DesignInputError('model', `a model refitted for every participant (${refits[i].models.map((m) => m.model).join(', ')})`, id);
    const p = fit.full.parameters;
    const model = { id, sensitivity: p.sensitivity, presentBias: p.presentBias };
    const counts = blank();
    let zone: ParticipantZone['zone'] = null;
    const probes = participant.pairs
      .filter((pair) => pair.role === 'reversal-probe')
      .map((pair, j) => {
        const { soonerAmount, laterAmount, soonerDelay, laterDelay } = pair.far;
        const z = soonerDelay > 0 ? reversalZone({ model, ratio: soonerAmount / laterAmount, soonDelay: soonerDelay, kSmall: p.kSmall, kLarge: p.kLarge }) : null;
        if (j === 0) zone = z;
        const position: ZonePosition = z === null ? 'no-zone' : laterDelay <= z.lower ? 'before' : laterDelay >= z.upper ? 'after' : 'inside';
        counts[position]++;
        result.probes[position]++;
        return { pairId: pair.pairId, lateDelay: laterDelay, soonDelay: soonerDelay, position };
      });
    const calibrationDelays = participant.calibration.map((c) => c.laterDelay);
    const probeDelays = probes.map((q) => q.lateDelay);
    const extrapolated = calibrationDelays.length > 0 && probeDelays.length > 0 && extrapolationWarning({ calibrationDelays, probeDelays }) !== null;
    const n = probes.length;
    if (n > 0) {
      if (counts['no-zone'] === n) result.noZone++;
      else if (counts.inside === n) result.allInside++;
      else if (counts.before > n / 2) result.mostlyBefore++;
      else if (counts.after > n / 2) result.mostlyAfter++;
    }
    if (extrapolated) result.extrapolated++;
    result.participants.push({
      participantId: participant.participantId,
      zone,
      probes,
      counts,
      longestCalibrationDelay: calibrationDelays.length ? Math.max(...calibrationDelays) : null,
      longestProbeDelay: probeDelays.length ? Math.max(...probeDelays) : null,
      extrapolated,
    });
  });
  result.findings = findings(result);
  return result;
}

function blank(): Record<ZonePosition, number> {
  return { before: 0, inside: 0, after: 0, 'no-zone': 0 };
}

function findings(d: ZoneDiagnosis): string[] {
  const total = d.probes.before + d.probes.inside + d.probes.after + d.probes['no-zone'];
  const n = d.participants.length;
  if (total === 0) return ['No reversal probes were answered, so there is nothing to place against a zone.'];
  const out = [`${d.probes.inside} of ${total} probes (${pct(d.probes.inside / total)}) fell inside the refitted reversal zone; ${d.allInside} of ${n} participants had every probe inside.`];
  if (d.mostlyAfter > 0) out.push(`${d.mostlyAfter} participant(s) had most probes after their refitted zone: at these delays they chose more impatiently than their calibration block suggested.`);
  if (d.mostlyBefore > 0) out.push(`${d.mostlyBefore} participant(s) had most probes before their refitted zone: at these delays they chose more patiently than their calibration block suggested.`);
  if (d.noZone > 0) out.push(`${d.noZone} participant(s) have no reversal zone under the refitted model at the probes' ratio and soon delay.`);
  if (d.extrapolated > 0) out.push(`For ${d.extrapolated} participant(s) the probes reached beyond 3 times the longest calibration delay, so their estimates were extrapolated.`);
  return out;
}

function pct(v: number): string {
  return `${Math.round(v * 1000) / 10} %`;
}
