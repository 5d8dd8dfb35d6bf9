/** The (n1, n2) orders of basis function k of `shapelets(maxOrder)`, in basis order. */
export function shapeletOrders(maxOrder: number): Array<readonly [number, number]> {
  const orders: Array<readonly [number, number]> = [];
  for (let total = 0; total <= maxOrder; total++) {
    for (let n1 = total; n1 >= 0; n1--) orders.push([n1, total - n1]);
  }
  return orders;
}
