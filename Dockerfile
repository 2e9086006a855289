# Tallyvat container images (docs/deploy.md). One build, two targets:
#   docker build --target web    -t tallyvat-web .      # the Next.js server (standalone output)
#   docker build --target worker -t tallyvat-worker .   # the job worker; also runs migrations
# Both come from the same source and lock file; deploy them with the same tag.

# ---- dependencies (every package, for the build) ----
FROM node:20-bookworm-slim AS deps
WORKDIR /app
COPY package.json package-lock.json ./
RUN npm ci --no-audit --no-fund

# ---- build: Next's standalone server and the worker bundle ----
FROM deps AS build
ENV NEXT_TELEMETRY_DISABLED=1 NEXT_OUTPUT=standalone
COPY . .
RUN node node_modules/next/dist/bin/next build \
 && node --input-type=module -e "const { buildWorker } = await import('./scripts/lib/worker-build.mjs'); await buildWorker({ force: true });" \
 && npm prune --omit=dev --no-audit --no-fund

# ---- web: only what the standalone server traced, plus static files and fonts ----
FROM node:20-bookworm-slim AS web
WORKDIR /app
ENV NODE_ENV=production NEXT_TELEMETRY_DISABLED=1 PORT=3000 HOSTNAME=0.0.0.0 KEEP_ALIVE_TIMEOUT=65000
COPY --from=build --chown=node:node /app/.next/standalone ./
COPY --from=build --chown=node:node /app/.next/static ./.next/static
COPY --from=build --chown=node:node /app/fonts ./fonts
USER node
EXPOSE 3000
# Liveness: GET /api/live. Readiness: GET /api/ready (database and storage bucket).
HEALTHCHECK --interval=15s --timeout=3s --start-period=20s CMD node -e "fetch('http://127.0.0.1:'+(process.env.PORT||3000)+'/api/live').then(r=>process.exit(r.ok?0:1),()=>process.exit(1))"
CMD ["node", "server.js"]

# ---- worker (and the release step: `npm run db:migrate`) ----
FROM node:20-bookworm-slim AS worker
WORKDIR /app
ENV NODE_ENV=production TALLYVAT_SERVICE=worker
COPY --from=build --chown=node:node /app/package.json /app/.sequelizerc ./
COPY --from=build --chown=node:node /app/node_modules ./node_modules
COPY --from=build --chown=node:node /app/scripts ./scripts
COPY --from=build --chown=node:node /app/migrations ./migrations
COPY --from=build --chown=node:node /app/fonts ./fonts
COPY --from=build --chown=node:node /app/.data/worker ./.data/worker
USER node
CMD ["node", "scripts/worker.mjs"]
