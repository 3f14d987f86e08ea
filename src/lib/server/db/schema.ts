export * from './auth.schema';
