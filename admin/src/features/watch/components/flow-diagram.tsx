import { useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import type { ConsortFlow as ConsortFlowData } from '../api/get-attrition-report';
import { downloadPng, downloadSvg } from '../utils/diagram-export';
import { ConsortFlow, ConsortFlowText } from './consort-flow';

/** The participant flow, its text version for screen readers, and downloads of the drawing as SVG and PNG. */
export function FlowDiagram({ flow, fileStem }: { flow: ConsortFlowData; fileStem: string }) {
  const svg = useRef<SVGSVGElement>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const save = (kind: 'svg' | 'png') => {
    if (!svg.current) return;
    setProblem(null);
    if (kind === 'svg') downloadSvg(svg.current, `${fileStem}.svg`);
    else
      downloadPng(svg.current, `${fileStem}.png`).catch((error: unknown) =>
        setProblem(error instanceof Error ? error.message : 'The image could not be made.'),
      );
  };
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-2">
        <Button size="compact" onClick={() => save('svg')}>
          Download diagram (SVG)
        </Button>
        <Button size="compact" onClick={() => save('png')}>
          Download diagram (PNG)
        </Button>
        {problem && <span className="text-sm text-danger">{problem}</span>}
      </div>
      <figure className="overflow-x-auto">
        <figcaption className="sr-only">Participant flow diagram; the same counts follow as a list.</figcaption>
        <ConsortFlow flow={flow} svgRef={svg} />
        <ConsortFlowText flow={flow} />
      </figure>
      <p className="text-xs text-ink-muted">
        Analysed by intention to treat counts everyone allocated, whatever happened to them; the completers beside it
        are those with complete outcome data. How missing outcomes are handled is the analysis plan's decision.
      </p>
    </div>
  );
}
