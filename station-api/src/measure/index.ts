export * from './efficiency';
export * from './regulation';
export * from './ripple';
export * from './transient';
export * from './acceptance';
export * from './buck';
