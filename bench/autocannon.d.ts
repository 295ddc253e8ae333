// autocannon ships without types; the load script uses it loosely.
declare module 'autocannon';
