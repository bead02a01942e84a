/**
 * The CLI's scenario input, through the reader the desktop app uses too (main/scenario-file.ts):
 * the same files are accepted and refused, with the same messages.
 */
import { readFile, stat } from 'node:fs/promises';
import type { ScenarioDocument } from '../../app/bridge/scenario-bytes';
import { electronConfig } from '../../electron.config';
import { readScenarioFile } from '../scenario-file';
import { printIssues, type CliIo } from './io';

/** The file's document, or null after saying on stderr why there is none (exit status 2). */
export async function readScenario(file: string | undefined, io: CliIo): Promise<ScenarioDocument | null> {
  if (file === undefined || file === '') {
    io.err('error: give a scenario file (e.g. assets/lumen6-imaging.scenario.json)');
    return null;
  }
  const r = await readScenarioFile({ stat: (p) => stat(p), readFile: (p) => readFile(p) }, file, electronConfig.limits.scenarioBytes);
  if (r.status === 'ok') return r.document;
  if (r.status === 'unreadable') io.err(`error: ${r.message}`);
  else printIssues(io, `${file} is not a scenario file`, r.errors);
  return null;
}
