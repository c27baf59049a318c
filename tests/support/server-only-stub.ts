// Vitest runs outside the React server environment; the real `server-only` module throws there.
export {};
