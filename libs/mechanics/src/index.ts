export * from './units';
export * from './formulas';
export * from './threads';
export * from './mechanics';
export * from './materials';
export * from './friction';
export * from './design';
export * from './evaluate';
