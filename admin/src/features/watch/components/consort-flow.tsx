import type { Ref } from 'react';
import type { ConsortFlow, FlowBox } from '../api/get-attrition-report';
import { wrapBoxText } from '../utils/wrap-box-text';

// Our own CONSORT 2010-style diagram: boxes sized from their wrapped text, arrows between stages.
const CHAR_WIDTH = 6.4;
const LINE_HEIGHT = 15;
const PAD = 8;
const STAGE_GAP = 34;

interface BoxText {
  title: string;
  lines: string[];
}

function wrap(text: string, width: number): string[] {
  return wrapBoxText(text, Math.max(8, Math.floor((width - 2 * PAD) / CHAR_WIDTH)));
}

function reasonLines(box: FlowBox): string[] {
  const lines = box.reasons.map((reason) => `${reason.reason ?? 'No reason recorded'} (n = ${reason.count})`);
  if (box.otherReasons > 0) lines.push(`Other reasons (n = ${box.otherReasons})`);
  return lines;
}

function boxHeight(box: BoxText, width: number): number {
  const title = wrap(box.title, width).length;
  const body = box.lines.flatMap((line) => wrap(`• ${line}`, width)).length;
  return PAD * 2 + (title + body) * LINE_HEIGHT;
}

function FlowRect({
  x,
  y,
  width,
  box,
  tone = 'plain',
}: {
  x: number;
  y: number;
  width: number;
  box: BoxText;
  tone?: 'plain' | 'stage';
}) {
  const height = boxHeight(box, width);
  const title = wrap(box.title, width);
  const body = box.lines.flatMap((line) => wrap(`• ${line}`, width));
  return (
    <g>
      <rect
        x={x}
        y={y}
        width={width}
        height={height}
        rx={4}
        fill={tone === 'stage' ? 'var(--color-spruce-soft)' : 'var(--color-surface)'}
        stroke="var(--color-line-strong)"
      />
      {title.map((line, index) => (
        <text
          key={`t${index}`}
          x={x + PAD}
          y={y + PAD + (index + 0.8) * LINE_HEIGHT}
          fontSize={12}
          fontWeight={600}
          fill="var(--color-ink)"
        >
          {line}
        </text>
      ))}
      {body.map((line, index) => (
        <text
          key={`b${index}`}
          x={x + PAD}
          y={y + PAD + (title.length + index + 0.8) * LINE_HEIGHT}
          fontSize={11}
          fill="var(--color-ink-muted)"
        >
          {line}
        </text>
      ))}
    </g>
  );
}

function Arrow({ x1, y1, x2, y2 }: { x1: number; y1: number; x2: number; y2: number }) {
  return (
    <line
      x1={x1}
      y1={y1}
      x2={x2}
      y2={y2}
      stroke="var(--color-ink-muted)"
      strokeWidth={1.25}
      markerEnd="url(#consort-arrow)"
    />
  );
}

function StageLabel({ y, height, label }: { y: number; height: number; label: string }) {
  return (
    <g>
      <rect x={0} y={y} width={22} height={height} rx={3} fill="var(--color-spruce)" />
      <text
        x={11}
        y={y + height / 2}
        fontSize={11}
        fontWeight={600}
        fill="var(--color-ink-inverse)"
        textAnchor="middle"
        transform={`rotate(-90 11 ${y + height / 2})`}
      >
        {label}
      </text>
    </g>
  );
}

export function ConsortFlow({ flow, svgRef }: { flow: ConsortFlow; svgRef?: Ref<SVGSVGElement> }) {
  const arms = flow.arms;
  const left = 34;
  const armWidth = 210;
  const armGap = 16;
  const width = Math.max(720, left + arms.length * armWidth + (arms.length - 1) * armGap + 8);
  const contentWidth = width - left - 8;
  const centre = left + contentWidth / 2;
  const mainWidth = 230;
  const sideWidth = Math.min(300, contentWidth / 2 - mainWidth / 2 - 24);
  const sideX = centre + mainWidth / 2 + 24;

  const assessed: BoxText = { title: `Assessed for eligibility (n = ${flow.assessedForEligibility})`, lines: [] };
  const excluded: BoxText = {
    title: `Excluded before randomization (n = ${flow.excludedBeforeRandomization.total})`,
    lines: reasonLines(flow.excludedBeforeRandomization),
  };
  const awaiting: BoxText = {
    title: `Not yet randomized (n = ${flow.awaitingRandomization.total})`,
    lines: [
      `Invited (n = ${flow.awaitingRandomization.invited})`,
      `Screened (n = ${flow.awaitingRandomization.screened})`,
      `Consented (n = ${flow.awaitingRandomization.consented})`,
    ],
  };
  const randomized: BoxText = { title: `Randomized (n = ${flow.randomized})`, lines: [] };

  let y = 8;
  const enrollmentTop = y;
  const assessedY = y;
  const sideHeight = boxHeight(excluded, sideWidth) + 8 + boxHeight(awaiting, sideWidth);
  const assessedHeight = boxHeight(assessed, mainWidth);
  y += Math.max(assessedHeight + STAGE_GAP, sideHeight + 12);
  const randomizedY = y;
  y += boxHeight(randomized, mainWidth);
  const enrollmentBottom = y;
  y += STAGE_GAP;

  const armX = (index: number) =>
    left + (contentWidth - (arms.length * armWidth + (arms.length - 1) * armGap)) / 2 + index * (armWidth + armGap);
  const allocation = arms.map((arm) => ({
    title: `Allocated to ${arm.name} (n = ${arm.allocated})`,
    lines: [
      arm.incompleteAtClose > 0
        ? `Did not complete by the close (n = ${arm.incompleteAtClose})`
        : `Still in follow-up (n = ${arm.stillInFollowUp})`,
    ],
  }));
  const followUp = arms.map((arm) => ({
    title: `Withdrew (n = ${arm.withdrew.total}) · Lost (n = ${arm.lostToFollowUp.total})`,
    lines: [
      ...reasonLines(arm.withdrew).map((line) => `Withdrew: ${line}`),
      ...reasonLines(arm.lostToFollowUp).map((line) => `Lost: ${line}`),
      ...(arm.excludedAfterRandomization.total > 0
        ? [
            `Excluded after randomization (n = ${arm.excludedAfterRandomization.total})`,
            ...reasonLines(arm.excludedAfterRandomization).map((line) => `Excluded: ${line}`),
          ]
        : []),
    ],
  }));
  const analysis = arms.map((arm) => ({
    title: `Analysed, intention to treat (n = ${arm.analysed})`,
    lines: [
      `Completers (n = ${arm.completers})`,
      `Without complete outcome data (n = ${arm.analysed - arm.completers})`,
    ],
  }));
  // At least tall enough for the rotated stage label beside the row.
  const rowHeight = (boxes: BoxText[]) => Math.max(...boxes.map((box) => boxHeight(box, armWidth)), 78);

  const allocationY = y;
  const allocationHeight = rowHeight(allocation);
  y += allocationHeight + STAGE_GAP;
  const followUpY = y;
  const followUpHeight = rowHeight(followUp);
  y += followUpHeight + STAGE_GAP;
  const analysisY = y;
  const analysisHeight = rowHeight(analysis);
  y += analysisHeight + 8;
  const branchY = allocationY - STAGE_GAP / 2;

  return (
    <svg
      ref={svgRef}
      xmlns="http://www.w3.org/2000/svg"
      viewBox={`0 0 ${width} ${y}`}
      width={width}
      height={y}
      className="mx-auto h-auto w-full min-w-[640px]"
      style={{ maxWidth: width * 1.15 }}
      aria-hidden="true"
      focusable="false"
    >
      <defs>
        <marker
          id="consort-arrow"
          viewBox="0 0 10 10"
          refX="9"
          refY="5"
          markerWidth="7"
          markerHeight="7"
          orient="auto-start-reverse"
        >
          <path d="M0 0 10 5 0 10z" fill="var(--color-ink-muted)" />
        </marker>
      </defs>
      <StageLabel y={enrollmentTop} height={enrollmentBottom - enrollmentTop} label="Enrollment" />
      <StageLabel y={allocationY} height={allocationHeight} label="Allocation" />
      <StageLabel y={followUpY} height={followUpHeight} label="Follow-up" />
      <StageLabel y={analysisY} height={analysisHeight} label="Analysis" />

      <FlowRect x={centre - mainWidth / 2} y={assessedY} width={mainWidth} box={assessed} tone="stage" />
      <FlowRect x={sideX} y={assessedY} width={sideWidth} box={excluded} />
      <FlowRect x={sideX} y={assessedY + boxHeight(excluded, sideWidth) + 8} width={sideWidth} box={awaiting} />
      <Arrow x1={centre} y1={assessedY + assessedHeight} x2={centre} y2={randomizedY} />
      <Arrow x1={centre} y1={assessedY + assessedHeight + 10} x2={sideX} y2={assessedY + assessedHeight + 10} />
      <FlowRect x={centre - mainWidth / 2} y={randomizedY} width={mainWidth} box={randomized} tone="stage" />

      {arms.length > 0 && (
        <>
          <line
            x1={centre}
            y1={enrollmentBottom}
            x2={centre}
            y2={branchY}
            stroke="var(--color-ink-muted)"
            strokeWidth={1.25}
          />
          <line
            x1={armX(0) + armWidth / 2}
            y1={branchY}
            x2={armX(arms.length - 1) + armWidth / 2}
            y2={branchY}
            stroke="var(--color-ink-muted)"
            strokeWidth={1.25}
          />
        </>
      )}
      {arms.map((arm, index) => {
        const x = armX(index);
        const mid = x + armWidth / 2;
        return (
          <g key={arm.conditionId}>
            <Arrow x1={mid} y1={branchY} x2={mid} y2={allocationY} />
            <FlowRect x={x} y={allocationY} width={armWidth} box={allocation[index]!} tone="stage" />
            <Arrow x1={mid} y1={allocationY + boxHeight(allocation[index]!, armWidth)} x2={mid} y2={followUpY} />
            <FlowRect x={x} y={followUpY} width={armWidth} box={followUp[index]!} />
            <Arrow x1={mid} y1={followUpY + boxHeight(followUp[index]!, armWidth)} x2={mid} y2={analysisY} />
            <FlowRect x={x} y={analysisY} width={armWidth} box={analysis[index]!} tone="stage" />
          </g>
        );
      })}
    </svg>
  );
}

/** The same flow as a nested list, for screen readers (the drawing is hidden from them). */
export function ConsortFlowText({ flow }: { flow: ConsortFlow }) {
  const reasons = (box: FlowBox) =>
    box.reasons.length > 0 || box.otherReasons > 0 ? (
      <ul>
        {box.reasons.map((reason, index) => (
          <li key={index}>
            {reason.reason ?? 'No reason recorded'}: {reason.count}
          </li>
        ))}
        {box.otherReasons > 0 && <li>Other reasons: {box.otherReasons}</li>}
      </ul>
    ) : null;
  return (
    <ol className="sr-only" aria-label="Participant flow, as text">
      <li>
        Enrollment: {flow.assessedForEligibility} assessed for eligibility; {flow.excludedBeforeRandomization.total}{' '}
        excluded before randomization
        {reasons(flow.excludedBeforeRandomization)}; {flow.awaitingRandomization.total} not yet randomized;{' '}
        {flow.randomized} randomized.
      </li>
      {flow.arms.map((arm) => (
        <li key={arm.conditionId}>
          Condition {arm.name}: {arm.allocated} allocated; {arm.stillInFollowUp} still in follow-up;{' '}
          {arm.withdrew.total} withdrew
          {reasons(arm.withdrew)}; {arm.lostToFollowUp.total} lost to follow-up{reasons(arm.lostToFollowUp)};{' '}
          {arm.excludedAfterRandomization.total} excluded after randomization{reasons(arm.excludedAfterRandomization)};
          {arm.incompleteAtClose > 0 ? ` ${arm.incompleteAtClose} did not complete by the close;` : ''} {arm.analysed}{' '}
          analysed by intention to treat, of whom {arm.completers} completed.
        </li>
      ))}
    </ol>
  );
}
