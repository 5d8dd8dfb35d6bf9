// Planar geometry for irregular grids: Delaunay triangulation, point location, barycentric
// interpolation weights, vertex neighbours and areas.
export { DelaunayTriangulation } from './delaunayTriangulation.js';
export { TriangulationStatus, triangulationStatusNames, type TriangulationStatusCode } from './triangulationStatus.js';
