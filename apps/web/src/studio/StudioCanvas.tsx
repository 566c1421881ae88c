// Lazy chunk: three.js, R3F and the shared scene load only when the studio opens.
import { FigureCanvas } from '../scene/FigureCanvas';
export default FigureCanvas;
