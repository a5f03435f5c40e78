export * from './users';
export * from './teams';
export * from './mail';
export * from './observations';
export * from './templates';
export * from './recipes';
