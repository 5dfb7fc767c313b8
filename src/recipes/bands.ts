export { DEFAULT_BANDS } from '../methods/bands.js';
