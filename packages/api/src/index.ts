export { createApp, type AppOptions, type BuiltApp } from './app.ts';
export { loadConfig, type Config } from './config.ts';
export { createDataSource, runMigrations } from './data-source.ts';
export { seedDemo } from './seed.ts';
