// Every integration test file talks to the real test database prepared by global-setup.
process.env.TZ = 'UTC';
