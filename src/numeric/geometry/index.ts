// Planar geometry for irregular grids: Delaunay triangulation, point location, barycentric
// and natural-neighbour interpolation weights (the latter also as a WebAssembly kernel),
// vertex neighbours, areas and cotangent edge weights.
export { barycentricWeights } from './barycentricWeights.js';
export { DelaunayTriangulation } from './delaunayTriangulation.js';
export { BARYCENTRIC_TOLERANCE, locateTriangle, scanTriangles } from './locateTriangle.js';
export { TriangulationStatus, triangulationStatusNames, type TriangulationStatusCode } from './triangulationStatus.js';
export { VertexAdjacency } from './vertexAdjacency.js';
export { vertexAreas } from './vertexAreas.js';
export { cotangentWeights } from './cotangentWeights.js';
export { MAX_NATURAL_NEIGHBOURS, NaturalNeighbourWeights } from './naturalNeighbourWeights.js';
export { NaturalNeighbourKernel } from './naturalNeighbourKernel.js';
