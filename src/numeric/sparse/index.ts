// Sparse symmetric positive-definite kernel: accumulate, order, factor, solve, inverse diagonal.
export { type SymmetricCsr, storedEntries } from './symmetricCsr.js';
export { SymmetricSparseAccumulator } from './symmetricSparseAccumulator.js';
export { ReverseCuthillMcKee } from './reverseCuthillMcKee.js';
export { EnvelopeCholesky } from './envelopeCholesky.js';
export { envelopeInverseDiagonal } from './envelopeInverseDiagonal.js';
export { NestedDissection, type PlanePoints } from './nestedDissection.js';
export { SupernodeChain } from './supernodeChain.js';
export { type SupernodeTree } from './supernodeTree.js';
export { MultifrontalCholesky } from './multifrontalCholesky.js';
export { type SupernodalFactor } from './supernodalFactor.js';
