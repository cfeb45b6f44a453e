import { createPowerSimulator, type PowerSimulator } from '@/lib/design/power/simulatePower';
import type { PowerScenario, PowerTally } from '@/lib/design/power/types';
import { buildScenario } from '@/lib/shared/power-scenario';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { assumedTruth, type PowerRunSpec } from '@/lib/shared/validations/power';

/** Replications of the design page's power preview: a few hundred, enough for a curve with a visible Monte Carlo band. */
export const PREVIEW_REPLICATIONS = 400;
/** Replications of the saved run a preview turns into. */
export const SAVED_RUN_REPLICATIONS = 2000;
/** The preview's seed (a saved run made from it keeps it). */
export const PREVIEW_SEED = 1;
/** Sample sizes the preview starts with, as the new-run form writes them. */
export const PREVIEW_SIZES = '20:200:20';

/**
 * What a preview simulates: the design as it stands in the form (spec and its prior's values) and
 * the test and sample sizes chosen beside the curve. The truth is the one the design assumes
 * (assumedTruth), with a simulated calibration block, as a new saved run starts.
 */
export type PreviewInput = {
  content: FrozenDesign;
  test: PowerRunSpec['test'];
  sampleSizes: number[];
  /** replications of the preview (the page uses PREVIEW_REPLICATIONS) */
  replications: number;
};

/** The settings of a preview's scenario, or of the saved run made from it (with more replications). */
export function previewSettings(input: PreviewInput, replications = input.replications): Pick<PowerRunSpec, 'truth' | 'calibration' | 'test' | 'sampleSizes' | 'replications' | 'seed'> {
  return { truth: assumedTruth(input.content), calibration: 'simulated', test: input.test, sampleSizes: input.sampleSizes, replications, seed: PREVIEW_SEED };
}

/** The engine's scenario of a preview (built in the preview's worker, off the page's thread). */
export function previewScenario(input: PreviewInput): PowerScenario {
  return buildScenario(previewSettings(input), input.content);
}

/** Page → worker: simulate replicates [from, to) of the preview `generation` asks for. */
export type PreviewChunkRequest = { generation: number; input: PreviewInput; from: number; to: number };

/** Worker → page: a chunk's tally (the scenario rides along for the summary), or what went wrong. */
export type PreviewChunkReply =
  | { generation: number; from: number; to: number; tally: PowerTally; longestCalibrationDelay: number | null; scenario: PowerScenario; error?: undefined }
  | { generation: number; error: string };

// the worker's prepared simulator for the input it last saw: its calibration caches grow across that preview's chunks
let prepared: { key: string; scenario: PowerScenario; simulator: PowerSimulator } | null = null;

/** What the preview's worker does with one request: simulate the chunk, or say what went wrong. */
export function answerPreviewChunk(request: PreviewChunkRequest): PreviewChunkReply {
  try {
    const key = JSON.stringify(request.input);
    if (prepared?.key !== key) {
      prepared = null;
      const scenario = previewScenario(request.input);
      prepared = { key, scenario, simulator: createPowerSimulator(scenario) };
    }
    const { scenario, simulator } = prepared;
    const tally = simulator.run(request.from, request.to);
    return { generation: request.generation, from: request.from, to: request.to, tally, longestCalibrationDelay: simulator.longestCalibrationDelay, scenario };
  } catch (error) {
    return { generation: request.generation, error: error instanceof Error ? error.message : String(error) };
  }
}
