/**
 * The text a plot PNG carries so that it stands alone in a report: the plot title, the scenario
 * name, what the time axis counts from (seconds from the scenario epoch, UTC) and the frame, and
 * the caution every export carries (engine/caution.ts). Pure: the caller measures text.
 */
import { CAUTION_TEXT, INERTIAL_FRAME } from '../../engine/caution';

export interface CaptionContext {
  scenarioName: string;
  epochUtc: string;
}

export interface CaptionLine {
  text: string;
  kind: 'title' | 'info' | 'caution';
}

/** The caption lines before wrapping. */
export function captionLines(title: string, c: CaptionContext): CaptionLine[] {
  return [
    { text: title, kind: 'title' },
    { text: `Scenario: ${c.scenarioName}`, kind: 'info' },
    { text: `Time axis: t in seconds from the scenario epoch ${c.epochUtc} (UTC); attitudes in ${INERTIAL_FRAME}`, kind: 'info' },
    { text: `Caution: ${CAUTION_TEXT}`, kind: 'caution' },
  ];
}

/** Greedy word wrap to `maxWidth` as measured by `measure` (a word longer than a line keeps its own line). */
export function wrapText(text: string, maxWidth: number, measure: (s: string) => number): string[] {
  const words = text.split(/\s+/).filter((w) => w !== '');
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    const next = line === '' ? w : `${line} ${w}`;
    if (line !== '' && measure(next) > maxWidth) {
      lines.push(line);
      line = w;
    } else line = next;
  }
  if (line !== '') lines.push(line);
  return lines;
}
