import { parentPort, workerData } from 'node:worker_threads';
import { minimumDetectableMass } from './minimumDetectableMass.js';
import { PlantedPerturberStatistic } from './plantedPerturberStatistic.js';
import { searchOf, type SensitivityAnswer, type SensitivityQuestion, type SensitivityTask } from './sensitivityTask.js';

// One worker thread: builds its statistic once, then answers grid points one at a time.
const task = workerData as SensitivityTask;
const statistic = new PlantedPerturberStatistic(task.config, task.data, task.bestFit, task.refit);
const search = searchOf(task, statistic);

parentPort!.on('message', (message: SensitivityQuestion) => {
  const result = minimumDetectableMass((m) => statistic.deltaChiSquare(message.xArcsec, message.yArcsec, m), search);
  const answer: SensitivityAnswer = { id: message.id, result };
  parentPort!.postMessage(answer);
});
parentPort!.postMessage({ ready: true });
