export { Figure, formatFigure, type FigureProps } from './figure';
