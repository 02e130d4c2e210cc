// Server integration tests run quietly; a test that wants logs can set LOG_LEVEL itself.
process.env.LOG_LEVEL = 'silent';
