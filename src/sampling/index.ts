export * from './diagnostics/index.js';
export * from './ensemble/index.js';
export * from './nested/index.js';
