/** Indices of the k lowest values, ascending (ties by index): k scans for small k, else a sort. */
export function lowestSlots(values: Float64Array, k: number): Int32Array {
  const slots = new Int32Array(k);
  if (k <= 8) {
    for (let j = 0; j < k; j++) {
      let best = -1;
      for (let i = 0; i < values.length; i++) {
        if (best !== -1 && !(values[i] < values[best])) continue;
        let taken = false;
        for (let previous = 0; previous < j; previous++) if (slots[previous] === i) taken = true;
        if (!taken) best = i;
      }
      slots[j] = best;
    }
    return slots;
  }
  const order = new Int32Array(values.length);
  for (let i = 0; i < values.length; i++) order[i] = i;
  order.sort((a, b) => values[a] - values[b] || a - b);
  slots.set(order.subarray(0, k));
  return slots;
}
