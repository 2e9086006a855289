// Stands in for 'server-only' in the worker bundle (the worker is server code by definition).
export {};
