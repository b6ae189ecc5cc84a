export { DrawnShape } from './drawn-shape';
