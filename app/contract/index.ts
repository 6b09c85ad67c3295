export * from './api.js';
export * from './channels.js';
export * from './result.js';
export * from './safety.js';
export * from './settings.js';
export * from './record-channels.js';
export * from './records.js';
