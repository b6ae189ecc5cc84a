export * from './fixture-simulator';
export * from './line-session';
export * from './scpi';
