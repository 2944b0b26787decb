/** Leadline presentation: numbers, units, words and dates as the report, the rules' messages and the pages print them. */
export * from './presentation';
export { browserModuleSource } from './browser-module';
