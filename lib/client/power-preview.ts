'use client';

import { useEffect, useRef, useState } from 'react';
import type { PreviewInput } from '@/lib/shared/power-preview';
import { PowerPreviewRunner, type PreviewState } from './power-preview-runner';

export type { PreviewState };

const IDLE: PreviewState = { status: 'idle', completed: 0, total: 0, summary: null, summaryInput: null, error: null, elapsedMs: null };

/**
 * The design page's live power preview: recomputed on Web Workers (power-preview.worker.ts) a
 * moment after each change of `input`; a newer change cancels the one running (PowerPreviewRunner).
 * null shows nothing new (e.g. while the form has an error).
 */
export function usePowerPreview(input: PreviewInput | null): PreviewState {
  const [state, setState] = useState<PreviewState>(IDLE);
  const runner = useRef<PowerPreviewRunner | null>(null);
  const key = input ? JSON.stringify(input) : '';
  useEffect(() => {
    const created = new PowerPreviewRunner({
      createWorker: () => new Worker(new URL('./power-preview.worker.ts', import.meta.url), { type: 'module', name: 'power-preview' }),
      onChange: setState,
    });
    runner.current = created;
    return () => {
      created.dispose();
      runner.current = null;
    };
  }, []);
  useEffect(() => {
    runner.current?.request(key ? (JSON.parse(key) as PreviewInput) : null);
  }, [key]);
  return state;
}
