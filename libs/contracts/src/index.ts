export * from './design-input';
export * from './records';
