export * from './fft.js';
