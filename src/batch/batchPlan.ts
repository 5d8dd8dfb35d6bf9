import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../errors.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import { batchLayout } from './batchLayout.js';
import type { BatchRow } from './batchRow.js';

export const BATCH_PLAN_FORMAT = 'arcsift batch plan';

/** batch.json: what a batch runs. Written once; a later run of the same batch must agree with it. */
export interface BatchPlan {
  readonly format: typeof BATCH_PLAN_FORMAT;
  readonly version: 1;
  readonly manifest: string;
  readonly rows: readonly BatchRow[];
  /** Options of the job's command given to every row (before the row's own). */
  readonly runOptions: readonly string[];
  /** Write each row's report.html (the commands' default) or not. */
  readonly reports: boolean;
}

/** Reads batch.json of a batch folder; a missing or foreign file is an InputError. */
export function readBatchPlan(out: string): BatchPlan {
  const file = batchLayout.plan(out);
  if (!existsSync(file)) throw new InputError(`not a batch folder: ${file} not found (a batch starts with \`arcsift batch run MANIFEST --out ${out}\`)`, { file });
  let plan: BatchPlan;
  try {
    plan = JSON.parse(readFileSync(file, 'utf8')) as BatchPlan;
  } catch (error) {
    throw new InputError(`not valid JSON: ${(error as Error).message}`, { file });
  }
  if (plan?.format !== BATCH_PLAN_FORMAT || plan.version !== 1 || !Array.isArray(plan.rows)) {
    throw new InputError(`expected a "${BATCH_PLAN_FORMAT}" version 1 file`, { file });
  }
  return plan;
}

/** What decides a row's result: everything but where it was written. */
function resultDefining(row: BatchRow): string {
  const { origin: _origin, ...rest } = row;
  return JSON.stringify(rest);
}

/**
 * The plan of a batch folder: written from the manifest's rows on the first run; on a later run
 * (a re-submission) the run options and every earlier row must be the same, so that finished
 * rows can be kept and interrupted ones resumed with the settings they started with. Rows may
 * be added (a calibration given more draws).
 */
export function settleBatchPlan(out: string, manifest: string, rows: readonly BatchRow[], runOptions: readonly string[], reports: boolean): BatchPlan {
  const plan: BatchPlan = { format: BATCH_PLAN_FORMAT, version: 1, manifest: resolve(manifest), rows, runOptions, reports };
  if (!existsSync(batchLayout.plan(out))) {
    writeJsonAtomic(batchLayout.plan(out), plan);
    return plan;
  }
  const earlier = readBatchPlan(out);
  const file = batchLayout.plan(out);
  if (JSON.stringify(earlier.runOptions) !== JSON.stringify(runOptions)) {
    throw new InputError(`this batch ran with the job options ${JSON.stringify(earlier.runOptions.join(' '))}, not ${JSON.stringify(runOptions.join(' '))}; give the same ones to resume it, or choose another --out`, { file });
  }
  const before = new Map(earlier.rows.map((r) => [r.id, r]));
  for (const row of rows) {
    const old = before.get(row.id);
    if (old !== undefined && resultDefining(old) !== resultDefining(row)) throw new InputError(`row ${row.id} (${row.origin}) differs from the row this batch started with; choose another --out for a changed manifest`, { file });
  }
  const now = new Set(rows.map((r) => r.id));
  const dropped = earlier.rows.find((r) => !now.has(r.id));
  if (dropped !== undefined) throw new InputError(`row ${dropped.id} of this batch is not in the manifest; choose another --out for a changed manifest`, { file });
  const added = rows.filter((r) => !before.has(r.id));
  const settled = { ...earlier, rows: [...earlier.rows, ...added], reports };
  if (earlier.reports !== reports || added.length > 0) writeJsonAtomic(file, settled);
  return settled;
}
