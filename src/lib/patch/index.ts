// The patch engine: pure functions over plain data, safe to import in the browser.
export * from './types';
export * from './footprint';
export * from './conflicts';
export * from './patch';
export * from './autoaddress';
export * from './rc';
export * from './convert';
export * from './numbering';
export * from './refresh';
export * from './colour';
export * from './diff';
export { sweep, type Claim, type SweepResult } from './sweep';
export * from './power';
export * from './describe';
export * from './bulk';
