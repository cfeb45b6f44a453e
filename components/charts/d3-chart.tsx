'use client';

import { useLayoutEffect, useRef } from 'react';

/**
 * An <svg> that a d3 drawing function fills; it redraws whenever `spec` changes. The drawing
 * functions (drawLineChart, drawScatterChart) are plain DOM code, reusable outside React.
 */
export function D3Chart<S extends { title: string }>({ draw, spec, className = '', testId }: { draw: (svg: SVGSVGElement, spec: S) => void; spec: S; className?: string; testId?: string }) {
  const ref = useRef<SVGSVGElement>(null);
  useLayoutEffect(() => {
    if (ref.current) draw(ref.current, spec);
  }, [draw, spec]);
  return (
    <figure className={className}>
      <svg ref={ref} className="h-auto w-full" data-testid={testId} />
      <figcaption className="sr-only">{spec.title}</figcaption>
    </figure>
  );
}
