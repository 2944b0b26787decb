export * from './design-input';
export * from './records';
export * from './api-schemas';
export * from './sizing';
export * from './text';
export * from './checks';
