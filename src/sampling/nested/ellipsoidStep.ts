import { buildEllipsoidUnion, sampleFromUnion } from './multiEllipsoid.js';
import type { NestedState } from './nestedState.js';
import { BatchEvaluator } from './batchEvaluator.js';
import { iterationsOf, absorbCounts, removeLowest, insertNewPoints, survivorRows } from './liveSet.js';

/** Largest ellipsoid-method batch, in candidates per likelihood call. */
const maxBatch = 8192;

/** Evaluations over which the acceptance estimate decays by e. */
const efficiencyMemory = 2000;

/** One step with candidates drawn by rejection from the multi-ellipsoid bound (or the whole cube). */
export async function ellipsoidStep(state: NestedState, evaluator: BatchEvaluator): Promise<void> {
  const { dim, physicalDim, livePoints, replacementsPerStep: k } = state.settings;
  const { slots, threshold } = removeLowest(state);
  const iterations = iterationsOf(state);
  if (iterations - state.boundBuiltAt >= state.settings.boundUpdateInterval) {
    const survivors = survivorRows(state);
    const union = buildEllipsoidUnion(survivors.rows, dim, survivors.count, state.lnX, {
      enlargement: state.settings.enlargement,
      minimumClusterSize: state.settings.minimumClusterSize,
      bootstraps: state.settings.bootstraps,
      volumeFactorForTesting: state.settings.boundVolumeFactorForTesting,
    }, state.stream);
    state.bound = union.lnVolumeSum >= 0 && state.settings.boundVolumeFactorForTesting === 1 ? null : union;
    state.boundBuiltAt = iterations;
  }
  const newUnit = new Float64Array(k * dim);
  const newPhysical = new Float64Array(k * physicalDim);
  const newLnL = new Float64Array(k);
  let accepted = 0;
  // Spare candidates from earlier batches come first, in draw order, if still above the threshold.
  const spareCount = state.spareLnL.count;
  let spareUsed = 0;
  while (spareUsed < spareCount && accepted < k) {
    if (state.spareLnL.get(spareUsed) > threshold) {
      for (let i = 0; i < dim; i++) newUnit[accepted * dim + i] = state.spareUnit.get(spareUsed, i);
      for (let i = 0; i < physicalDim; i++) newPhysical[accepted * physicalDim + i] = state.sparePhysical.get(spareUsed, i);
      newLnL[accepted] = state.spareLnL.get(spareUsed);
      accepted++;
    }
    spareUsed++;
  }
  state.spareUnit.dropFirst(spareUsed);
  state.sparePhysical.dropFirst(spareUsed);
  state.spareLnL.dropFirst(spareUsed);
  const scratch = new Float64Array(dim);
  const candidate = new Float64Array(dim);
  while (accepted < k) {
    const needed = k - accepted;
    const efficiency = state.recentValid / state.recentEvaluated;
    const batch = Math.min(maxBatch, Math.max(needed, Math.ceil(needed / efficiency)));
    const unit = new Float64Array(batch * dim);
    for (let row = 0; row < batch; row++) {
      if (state.bound === null) {
        for (let i = 0; i < dim; i++) unit[row * dim + i] = state.stream.uniform();
        continue;
      }
      for (;;) {
        sampleFromUnion(state.bound, state.stream, candidate, scratch);
        let inside = true;
        for (let i = 0; i < dim; i++) if (!(candidate[i] >= 0 && candidate[i] <= 1)) inside = false;
        if (inside) break;
      }
      unit.set(candidate, row * dim);
    }
    const physical = new Float64Array(batch * physicalDim);
    const lnL = await evaluator.evaluate(unit, batch, physical);
    let valid = 0;
    for (let row = 0; row < batch; row++) {
      if (!(lnL[row] > threshold)) continue;
      valid++;
      if (accepted < k) {
        newUnit.set(unit.subarray(row * dim, row * dim + dim), accepted * dim);
        newPhysical.set(physical.subarray(row * physicalDim, row * physicalDim + physicalDim), accepted * physicalDim);
        newLnL[accepted] = lnL[row];
        accepted++;
      } else if (state.spareLnL.count < livePoints) {
        state.spareUnit.push(unit, row * dim);
        state.sparePhysical.push(physical, row * physicalDim);
        state.spareLnL.pushValue(lnL[row]);
      }
    }
    const decay = Math.exp(-batch / efficiencyMemory);
    state.recentValid = state.recentValid * decay + valid;
    state.recentEvaluated = state.recentEvaluated * decay + batch;
    if (state.recentValid < 1e-3 * state.recentEvaluated) state.recentValid = 1e-3 * state.recentEvaluated;
  }
  state.replacementsAccepted += k;
  state.replacementEvaluations += absorbCounts(state, evaluator);
  insertNewPoints(state, slots, newUnit, newPhysical, newLnL);
}
