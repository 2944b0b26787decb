export * from './design-input';
