// `server-only` throws when bundled for the client; under vitest there is no bundler, so the
// lib modules that import it are loaded with this empty stand-in.
export {};
