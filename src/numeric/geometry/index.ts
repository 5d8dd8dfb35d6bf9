// Planar geometry for irregular grids: Delaunay triangulation, point location, barycentric
// interpolation weights, vertex neighbours and areas.
export { barycentricWeights } from './barycentricWeights.js';
export { DelaunayTriangulation } from './delaunayTriangulation.js';
export { BARYCENTRIC_TOLERANCE, locateTriangle, scanTriangles } from './locateTriangle.js';
export { TriangulationStatus, triangulationStatusNames, type TriangulationStatusCode } from './triangulationStatus.js';
export { VertexAdjacency } from './vertexAdjacency.js';
export { vertexAreas } from './vertexAreas.js';
