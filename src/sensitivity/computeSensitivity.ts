import { Worker } from 'node:worker_threads';
import { workerScriptUrl } from '../parallel/workerScriptUrl.js';
import { minimumDetectableMass, type MinimumDetectableMass } from './minimumDetectableMass.js';
import { PlantedPerturberStatistic } from './plantedPerturberStatistic.js';
import type { SensitivityPoint } from './sensitivityGrid.js';
import { searchOf, type SensitivityAnswer, type SensitivityTask } from './sensitivityTask.js';

/**
 * The minimum detectable mass at every grid point. With one thread everything runs here; with
 * more, up to `threads` worker threads each take the next unanswered point (results do not depend
 * on which thread answers, each point being computed alone and deterministically).
 */
export async function computeSensitivity(
  task: SensitivityTask, points: readonly SensitivityPoint[], threads: number,
  onPoint?: (done: number, total: number) => void,
): Promise<MinimumDetectableMass[]> {
  const results = new Array<MinimumDetectableMass>(points.length);
  const count = Math.max(1, Math.min(Math.floor(threads), points.length));
  if (count === 1) {
    const statistic = new PlantedPerturberStatistic(task.config, task.data, task.bestFit, task.refit);
    const search = searchOf(task, statistic);
    points.forEach((point, k) => {
      results[k] = minimumDetectableMass((m) => statistic.deltaChiSquare(point.xArcsec, point.yArcsec, m), search);
      onPoint?.(k + 1, points.length);
    });
    return results;
  }
  const url = workerScriptUrl(import.meta.url, './sensitivityWorker.js');
  let next = 0;
  let done = 0;
  const workers: Worker[] = [];
  try {
    await Promise.all(Array.from({ length: count }, () => new Promise<void>((resolve, reject) => {
      const worker = new Worker(url, { workerData: task });
      workers.push(worker);
      const send = (): void => {
        if (next >= points.length) { resolve(); return; }
        const id = next++;
        worker.postMessage({ id, xArcsec: points[id].xArcsec, yArcsec: points[id].yArcsec });
      };
      worker.on('error', reject);
      worker.on('message', (message: { ready?: boolean } & Partial<SensitivityAnswer>) => {
        if (message.id !== undefined && message.result !== undefined) {
          results[message.id] = message.result;
          onPoint?.(++done, points.length);
        }
        send();
      });
    })));
  } finally {
    await Promise.all(workers.map((worker) => worker.terminate()));
  }
  return results;
}
