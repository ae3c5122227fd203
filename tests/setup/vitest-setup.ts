// Vitest setup: fail on unexpected console.error (STYLE.md: an unexpected console.error fails a test).
