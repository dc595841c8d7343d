# thermargin services (ingester, analyzer, API with the dashboard) in one image; docker-compose.yml
# picks the entry point per service. Stages: `build` installs everything and builds the dashboard,
# `deps` installs the runtime dependencies only (native modules compiled here, for this image's
# Node), `runtime` holds those, the service sources and the built dashboard, run as a non-root user.
FROM node:20-bookworm-slim AS base
WORKDIR /app
# Build tools for native modules (better-sqlite3) when no prebuilt binary matches.
RUN apt-get update \
  && apt-get install -y --no-install-recommends python3 make g++ \
  && rm -rf /var/lib/apt/lists/*
COPY package.json package-lock.json ./
COPY shared/package.json shared/
COPY core/package.json core/
COPY web/package.json web/
COPY services/analyzer/package.json services/analyzer/
COPY services/api/package.json services/api/
COPY services/broker/package.json services/broker/
COPY services/cli/package.json services/cli/
COPY services/ingester/package.json services/ingester/
COPY services/logger-data/package.json services/logger-data/
COPY services/simulator/package.json services/simulator/
COPY services/stack/package.json services/stack/
COPY services/store/package.json services/store/
COPY services/usecases/package.json services/usecases/

FROM base AS build
RUN npm ci --no-audit --no-fund
COPY tsconfig.json ./
COPY shared shared
COPY core core
COPY web web
RUN npm run build:web

FROM base AS deps
RUN npm ci --omit=dev --no-audit --no-fund

FROM node:20-bookworm-slim AS runtime
ENV NODE_ENV=production
WORKDIR /app
COPY --from=deps /app/node_modules node_modules
COPY package.json tsconfig.json ./
COPY shared shared
COPY core core
COPY services services
COPY --from=build /app/web/dist web/dist
COPY web/package.json web/
RUN mkdir -p /data && chown node:node /data
USER node
EXPOSE 8080 9464 9470
CMD ["node", "--import", "tsx", "services/api/src/main.ts"]
