// Quiet logs unless a run asks for them (LOG_LEVEL=debug npx jest …).
process.env.LOG_LEVEL ??= 'silent';
