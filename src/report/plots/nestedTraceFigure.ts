import { writeSvgFigure, type ReportFigure } from './reportFigure.js';
import { nestedTraceSvg } from './samplerTraceSvg.js';

/** The evidence history of one or more nested-sampling runs (nestedTraceSvg) as a figure. */
export function nestedTraceFigure(runs: Parameters<typeof nestedTraceSvg>[0], folder: string): ReportFigure {
  return writeSvgFigure(folder, 'nested-history', 'nested-history', {
    section: 'diagnostics',
    title: 'Nested-sampling history',
    caption: 'Left: ln Z accumulated point by point, the final value dashed; a run that stopped early shows a curve still rising. Right: ln L against the ln of the prior volume X still enclosed (Skilling 2006); the posterior mass lies where ln L flattens.',
    svg: nestedTraceSvg(runs),
  });
}
