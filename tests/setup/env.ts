// Tests run against the project's test cluster prepared by scripts/test.ts.
process.env.NODE_ENV ??= 'test';
