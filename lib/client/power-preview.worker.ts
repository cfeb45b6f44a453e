// The design page's power preview, in a Web Worker: simulates the chunks of replicates the page asks
// for (answerPreviewChunk), so the page's own thread only merges counts.
import { answerPreviewChunk, type PreviewChunkRequest } from '@/lib/shared/power-preview';

self.onmessage = (event: MessageEvent<PreviewChunkRequest>) => {
  self.postMessage(answerPreviewChunk(event.data));
};
