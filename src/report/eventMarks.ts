/**
 * Event marks for the time plots: a thin vertical line at each trigger, crowbar onset, armature start and the end of
 * the in-bore phase (exit, stall, end time), labelled at the top of the plot with the full instant on hover. Events of
 * one kind at one instant share a mark ("trigger G1, G2"). Labels are user text (group names): escaped for plotly.
 */
import type { EventKind, ShotEvent } from '../solve/types.js';
import { formatQuantity, type Scale } from '../units/format.js';
import { plotlyText } from './escape.js';

const MARKED: Partial<Record<EventKind, { text: string; colour: string; dash: string }>> = {
  trigger: { text: 'trigger', colour: '#1f3b73', dash: 'dot' },
  crowbar: { text: 'crowbar', colour: '#8a6d00', dash: 'dash' },
  start: { text: 'armature starts', colour: '#2f7d32', dash: 'dot' },
  exit: { text: 'muzzle exit', colour: '#9c1c1c', dash: 'solid' },
  stall: { text: 'stall', colour: '#9c1c1c', dash: 'solid' },
  timeout: { text: 'end time', colour: '#9c1c1c', dash: 'solid' },
};

export interface EventMark {
  t: number;
  kind: EventKind;
  /** e.g. "trigger G1, G2" (plain text; escaped when drawn) */
  label: string;
}

/** The marks of a shot's events, one per kind and instant, in time order. */
export function eventMarks(events: readonly ShotEvent[], groupLabels: readonly string[]): EventMark[] {
  const marks = new Map<string, EventMark & { groups: string[] }>();
  for (const event of events) {
    const style = MARKED[event.kind];
    if (!style) continue;
    const key = `${event.kind}@${event.t}`;
    const mark = marks.get(key) ?? { t: event.t, kind: event.kind, label: style.text, groups: [] };
    if (event.group !== undefined) mark.groups.push(groupLabels[event.group] ?? `group ${event.group + 1}`);
    marks.set(key, mark);
  }
  return [...marks.values()]
    .sort((a, b) => a.t - b.t)
    .map(({ t, kind, label, groups }) => ({ t, kind, label: groups.length ? `${label} ${groups.join(', ')}` : label }));
}

/** Plotly shapes (vertical lines across the whole plot area) and labels for the marks, on a time axis in `time`. */
export function markLayout(marks: readonly EventMark[], time: Scale): { shapes: Record<string, unknown>[]; annotations: Record<string, unknown>[] } {
  const shapes = marks.map((mark) => {
    const style = MARKED[mark.kind]!;
    const x = mark.t * time.factor;
    return { type: 'line', xref: 'x', yref: 'paper', x0: x, x1: x, y0: 0, y1: 1, line: { color: style.colour, width: 1, dash: style.dash }, layer: 'below' };
  });
  const annotations = marks.map((mark) => ({
    x: mark.t * time.factor,
    xref: 'x',
    y: 1,
    yref: 'paper',
    text: plotlyText(mark.label),
    hovertext: plotlyText(`${mark.label} at ${formatQuantity(mark.t, 's')}`),
    showarrow: false,
    textangle: -90,
    xanchor: 'left',
    yanchor: 'top',
    font: { size: 9, color: MARKED[mark.kind]!.colour },
    bgcolor: 'rgba(255,255,255,0.7)',
  }));
  return { shapes, annotations };
}
