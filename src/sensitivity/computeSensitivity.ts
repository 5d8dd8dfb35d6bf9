import { RunInterrupted } from '../errors.js';
import { WorkerPool } from '../parallel/workerPool.js';
import { workerScriptUrl } from '../parallel/workerScriptUrl.js';
import { minimumDetectableMass, type MinimumDetectableMass } from './minimumDetectableMass.js';
import { PlantedPerturberStatistic } from './plantedPerturberStatistic.js';
import type { SensitivityPoint } from './sensitivityGrid.js';
import { searchOf, type SensitivityAnswer, type SensitivityQuestion, type SensitivityTask } from './sensitivityTask.js';

/**
 * The minimum detectable mass at every grid point. With one thread everything runs here; with
 * more, the points are shared among worker threads (a WorkerPool; results do not depend on which
 * thread answers, each point being computed alone and deterministically). A stop request ends
 * it between points with RunInterrupted (the map has no checkpoint: a resume computes it again).
 */
export async function computeSensitivity(
  task: SensitivityTask, points: readonly SensitivityPoint[], threads: number,
  onPoint?: (done: number, total: number) => void, signal?: { stopRequested: boolean },
): Promise<MinimumDetectableMass[]> {
  const results = new Array<MinimumDetectableMass>(points.length);
  const count = Math.max(1, Math.min(Math.floor(threads), points.length));
  if (count === 1) {
    const statistic = new PlantedPerturberStatistic(task.config, task.data, task.bestFit, task.refit);
    const search = searchOf(task, statistic);
    for (let k = 0; k < points.length; k++) {
      // Yield to the event loop between points, so that a signal's handler can run.
      await new Promise((resolve) => { setImmediate(resolve); });
      if (signal?.stopRequested === true) throw new RunInterrupted([]);
      const point = points[k];
      results[k] = minimumDetectableMass((m) => statistic.deltaChiSquare(point.xArcsec, point.yArcsec, m), search);
      onPoint?.(k + 1, points.length);
    }
    return results;
  }
  const pool = await WorkerPool.start<SensitivityQuestion, SensitivityAnswer>(
    workerScriptUrl(import.meta.url, './sensitivityWorker.js'), task, count,
  );
  try {
    let done = 0;
    await Promise.all(points.map((point, id) => new Promise<void>((resolve, reject) => {
      pool.submit({
        message: { id, xArcsec: point.xArcsec, yArcsec: point.yArcsec },
        done: (answer) => {
          results[answer.id] = answer.result;
          onPoint?.(++done, points.length);
          if (signal?.stopRequested === true) reject(new RunInterrupted([]));
          else resolve();
        },
        reject,
      });
    })));
  } finally {
    await pool.close();
  }
  return results;
}
